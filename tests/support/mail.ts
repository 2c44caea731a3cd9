export interface CaughtMail {
  id: number;
  to: string[];
  subject: string;
  text: string;
}

const catcher = () => {
  const url = process.env.MAIL_CATCHER_URL;
  if (!url) throw new Error("MAIL_CATCHER_URL is not set: run the suite through `npm test`.");
  return url;
};

/** Waits until the mail catcher has a message for `to` matching `subject`. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 15_000): Promise<CaughtMail> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const response = await fetch(new URL(`/messages?to=${encodeURIComponent(to)}`, catcher()));
    const messages = (await response.json()) as CaughtMail[];
    const found = messages.find((m) => subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}

export function firstLink(text: string): string {
  const match = text.match(/https?:\/\/\S+/);
  if (!match) throw new Error(`no link in mail:\n${text}`);
  return match[0];
}
