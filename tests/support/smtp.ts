import net from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

export interface ReceivedMail {
  to: string;
  subject: string;
}

/**
 * An SMTP server on a free loopback port that a test opens and closes at will, to play
 * a mail server that is down and comes back. Point SMTP_URL at `url` before importing
 * server modules.
 */
export async function privateSmtp() {
  const port = await new Promise<number>((resolve) => {
    const probe = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });
  const received: ReceivedMail[] = [];
  let server: SMTPServer | undefined;
  return {
    url: `smtp://127.0.0.1:${port}`,
    received,
    start(): Promise<void> {
      server = new SMTPServer({
        authOptional: true,
        disabledCommands: ["STARTTLS"],
        logger: false,
        onData(stream, session, callback) {
          simpleParser(stream).then((mail) => {
            received.push({ to: session.envelope.rcptTo[0]!.address, subject: mail.subject ?? "" });
            callback();
          }, callback);
        },
      });
      return new Promise((resolve) => server!.listen(port, "127.0.0.1", () => resolve()));
    },
    stop(): Promise<void> {
      return new Promise((resolve) => (server ? server.close(() => resolve()) : resolve()));
    },
  };
}
