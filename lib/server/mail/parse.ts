/**
 * A deliberately small MIME reader for the development outbox: headers (unfolded, RFC 2047 encoded
 * words decoded), and the first text/plain and text/html parts of a possibly multipart message,
 * with base64 and quoted-printable bodies decoded (RFC 2045 §6.7, §6.8).
 */
export type ParsedMessage = { from: string; to: string; subject: string; text: string | null; html: string | null };

type Part = { headers: Map<string, string>; body: string };

function splitHeadersAndBody(raw: string): Part {
  const normalised = raw.replace(/\r\n/g, "\n");
  const cut = normalised.indexOf("\n\n");
  const headerText = cut === -1 ? normalised : normalised.slice(0, cut);
  const body = cut === -1 ? "" : normalised.slice(cut + 2);
  const headers = new Map<string, string>();
  // Unfold: a line starting with white space continues the previous header (RFC 5322 §2.2.3).
  const unfolded = headerText.replace(/\n[ \t]+/g, " ");
  for (const line of unfolded.split("\n")) {
    const colon = line.indexOf(":");
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function bytesToUtf8(bytes: number[]): string {
  return Buffer.from(bytes).toString("utf8");
}

export function decodeQuotedPrintable(input: string): string {
  const withoutSoftBreaks = input.replace(/=\r?\n/g, "");
  const bytes: number[] = [];
  for (let i = 0; i < withoutSoftBreaks.length; i++) {
    const ch = withoutSoftBreaks[i];
    const hex = withoutSoftBreaks.slice(i + 1, i + 3);
    if (ch === "=" && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else {
      for (const b of Buffer.from(ch, "utf8")) bytes.push(b);
    }
  }
  return bytesToUtf8(bytes);
}

/** Decode `=?charset?B|Q?...?=` words in a header value (UTF-8 and ASCII charsets). */
export function decodeEncodedWords(value: string): string {
  return value
    .replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?)/g, "$1")
    .replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_match, _charset: string, encoding: string, text: string) => {
      if (encoding.toUpperCase() === "B") return Buffer.from(text, "base64").toString("utf8");
      return decodeQuotedPrintable(text.replace(/_/g, " "));
    });
}

function decodeBody(part: Part): string {
  const encoding = (part.headers.get("content-transfer-encoding") ?? "7bit").toLowerCase();
  if (encoding === "base64") return Buffer.from(part.body.replace(/\s+/g, ""), "base64").toString("utf8");
  if (encoding === "quoted-printable") return decodeQuotedPrintable(part.body);
  return part.body;
}

function boundaryOf(contentType: string): string | null {
  const match = /boundary\s*=\s*(?:"([^"]+)"|([^;\s]+))/i.exec(contentType);
  return match ? (match[1] ?? match[2]) : null;
}

function collectParts(part: Part, out: { text: string | null; html: string | null }, depth = 0): void {
  const contentType = (part.headers.get("content-type") ?? "text/plain").toLowerCase();
  const boundary = contentType.startsWith("multipart/") ? boundaryOf(part.headers.get("content-type") ?? "") : null;
  if (boundary && depth < 5) {
    const sections = part.body.split(`--${boundary}`);
    for (const section of sections.slice(1)) {
      if (section.startsWith("--")) break;
      // The line break before a boundary belongs to the boundary (RFC 2046 §5.1.1).
      collectParts(splitHeadersAndBody(section.replace(/^\n/, "").replace(/\n$/, "")), out, depth + 1);
    }
    return;
  }
  if (contentType.startsWith("text/plain") && out.text === null) out.text = decodeBody(part).replace(/\n$/, "");
  else if (contentType.startsWith("text/html") && out.html === null) out.html = decodeBody(part);
}

export function parseMessage(raw: string): ParsedMessage {
  const top = splitHeadersAndBody(raw);
  const bodies = { text: null as string | null, html: null as string | null };
  collectParts(top, bodies);
  return {
    from: decodeEncodedWords(top.headers.get("from") ?? ""),
    to: decodeEncodedWords(top.headers.get("to") ?? ""),
    subject: decodeEncodedWords(top.headers.get("subject") ?? ""),
    ...bodies,
  };
}
