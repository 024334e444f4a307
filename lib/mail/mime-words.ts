import { simpleParser } from "mailparser";

/**
 * A header value as the recipient reads it: RFC 2047 encoded words ("=?UTF-8?Q?Caf=C3=A9?=")
 * decoded by mailparser, the library that reads the whole message. Plain values pass through.
 */
export async function decodeHeaderWords(raw: string): Promise<string> {
  if (!raw.includes("=?")) return raw;
  const parsed = await simpleParser(Buffer.from(`Subject: ${raw}\r\n\r\n`, "latin1"), {
    skipHtmlToText: true,
    skipTextToHtml: true,
    skipTextLinks: true,
    skipImageLinks: true,
  });
  return parsed.subject ?? raw;
}
