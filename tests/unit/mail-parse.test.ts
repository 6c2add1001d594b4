import { describe, expect, it } from "vitest";
import { decodeEncodedWords, decodeQuotedPrintable, parseMessage } from "@/lib/server/mail/parse";

describe("outbox message parser", () => {
  // RFC 2045 §6.7 rule (5): a trailing "=" is a soft line break; "=XX" is an octet in hex.
  it("decodes quoted-printable soft line breaks so long links survive", () => {
    const encoded = "Accept: http://localhost:3000/invite/abcdefghijklmnopqrstuvwxyz0123456789ABCDEFG=\r\nHIJ and =3D sign";
    expect(decodeQuotedPrintable(encoded)).toBe("Accept: http://localhost:3000/invite/abcdefghijklmnopqrstuvwxyz0123456789ABCDEFGHIJ and = sign");
  });

  // RFC 2045 §6.7: octets above 127 are written as =XX; UTF-8 "é" is C3 A9.
  it("decodes quoted-printable UTF-8 octets", () => {
    expect(decodeQuotedPrintable("caf=C3=A9")).toBe("café");
  });

  // RFC 2047 §8 examples of encoded words: "=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=" displays as "ab".
  it("decodes RFC 2047 encoded words and joins adjacent ones", () => {
    expect(decodeEncodedWords("=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=")).toBe("ab");
    expect(decodeEncodedWords("=?UTF-8?B?Q2Fmw6kgbWVldGluZw==?=")).toBe("Café meeting");
    expect(decodeEncodedWords("=?UTF-8?Q?Reset_your_password?=")).toBe("Reset your password");
  });

  it("reads headers, text and html parts of a multipart/alternative message", () => {
    const raw = [
      "From: Portolan <no-reply@portolan.example>",
      "To: nell@example.test",
      "Subject: =?UTF-8?Q?Invitation_to_H=C3=A9ron?=",
      "MIME-Version: 1.0",
      'Content-Type: multipart/alternative; boundary="--_b1"',
      "",
      "----_b1",
      "Content-Type: text/plain; charset=utf-8",
      "Content-Transfer-Encoding: base64",
      "",
      Buffer.from("Open http://localhost:3000/invite/tok_EN-123").toString("base64"),
      "----_b1",
      "Content-Type: text/html; charset=utf-8",
      "Content-Transfer-Encoding: quoted-printable",
      "",
      '<a href=3D"http://localhost:3000/invite/tok_EN-123">Open</a>',
      "----_b1--",
      "",
    ].join("\r\n");
    expect(parseMessage(raw)).toEqual({
      from: "Portolan <no-reply@portolan.example>",
      to: "nell@example.test",
      subject: "Invitation to Héron",
      text: "Open http://localhost:3000/invite/tok_EN-123",
      html: '<a href="http://localhost:3000/invite/tok_EN-123">Open</a>',
    });
  });

  it("unfolds folded headers (RFC 5322 §2.2.3)", () => {
    expect(parseMessage("Subject: a long\r\n subject line\r\n\r\nbody").subject).toBe("a long subject line");
  });
});
