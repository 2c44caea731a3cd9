#!/usr/bin/env node
// Development and test stand-in for a mail server: accepts SMTP on 127.0.0.1 and keeps
// every message in memory, listed as JSON over HTTP (GET /messages, DELETE /messages).
// The app's /dev/mail page reads the same list. Never used in production.
import http from "node:http";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

const smtpPort = Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 1025);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 1080);
const messages = [];
let nextId = 1;

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  logger: false,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        messages.push({
          id: nextId++,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? "",
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
        });
        callback();
      })
      .catch(callback);
  },
});

const api = http.createServer((req, res) => {
  const url = new URL(req.url ?? "/", "http://localhost");
  if (url.pathname === "/messages" && req.method === "GET") {
    const to = url.searchParams.get("to");
    const list = to ? messages.filter((m) => m.to.includes(to)) : messages;
    res.writeHead(200, { "content-type": "application/json" });
    res.end(JSON.stringify(list.slice().reverse()));
  } else if (url.pathname === "/messages" && req.method === "DELETE") {
    messages.length = 0;
    res.writeHead(204).end();
  } else if (url.pathname === "/healthz") {
    res.writeHead(200).end("ok");
  } else {
    res.writeHead(404).end();
  }
});

smtp.listen(smtpPort, "127.0.0.1", () => {
  api.listen(httpPort, "127.0.0.1", () => {
    console.log(`[mail-catcher] SMTP on 127.0.0.1:${smtpPort}, messages at http://127.0.0.1:${httpPort}/messages`);
  });
});

for (const signal of ["SIGTERM", "SIGINT"]) {
  process.once(signal, () => {
    api.close();
    smtp.close(() => process.exit(0));
    setTimeout(() => process.exit(0), 1000).unref();
  });
}
