import { describe, expect, it } from "vitest";
import { emailConfirmationMail, escapeHtml, formatExpiry, invitationMail, passwordResetMail } from "./templates";

// An ampersand in the query: the character that must be &amp; inside an href and must stay a
// bare & in the plain text.
const inviteUrl = "https://visitwort.test/invite/secret-token?next=%2Fvisits&lang=en";
const expiresAt = new Date("2026-12-09T14:05:00Z");

describe("escapeHtml", () => {
  it("replaces the five characters that are markup in text and in quoted attributes", () => {
    // OWASP Cross Site Scripting Prevention Cheat Sheet, "Output Encoding for HTML Contexts"
    // and "… for HTML Attribute Contexts": & < > " ' become character references.
    expect(escapeHtml(`<a href="x" title='y'>Tom & Jerry</a>`)).toBe("&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;Tom &amp; Jerry&lt;/a&gt;");
  });

  it("leaves ordinary text alone", () => {
    // common practice, no source
    expect(escapeHtml("Wiesen-Flockenblume, 12 Besuche")).toBe("Wiesen-Flockenblume, 12 Besuche");
  });
});

describe("invitationMail", () => {
  const mail = invitationMail({
    inviteUrl,
    roles: ["recorder", "coordinator"],
    invitedByName: `Robin <script>alert("hi")</script>`,
    expiresAt,
  });

  it("escapes a name containing a script tag in the HTML part", () => {
    // OWASP Cross Site Scripting Prevention Cheat Sheet, "Output Encoding for HTML Contexts":
    // untrusted data in element content is entity-encoded.
    expect(mail.html).not.toContain("<script>");
    expect(mail.html).toContain("Robin &lt;script&gt;alert(&quot;hi&quot;)&lt;/script&gt;");
    // The plain text part is not markup: the name appears as typed.
    expect(mail.text).toContain(`Robin <script>alert("hi")</script> invited you`);
  });

  it("carries the link in both parts, attribute-escaped in the HTML", () => {
    // common practice, no source: every part a reader may be shown must contain the link.
    expect(mail.text).toContain(inviteUrl);
    expect(mail.html).toContain(`href="${inviteUrl.replace("&", "&amp;")}"`);
    expect(mail.html).not.toContain(inviteUrl);
  });

  it("names the product, the roles, the expiry and what to do if unexpected", () => {
    // common practice, no source
    expect(mail.subject).toBe("You are invited to Visitwort");
    expect(mail.text).toContain("as recorder and coordinator");
    expect(mail.text).toContain("9 December 2026, 14:05 UTC");
    expect(mail.text).toMatch(/did not expect this.*ignore it/);
    expect(mail.html).toMatch(/did not expect this.*ignore it/);
  });

  it("keeps names out of the subject", () => {
    // common practice, no source: the subject is shown in the inbox list, before the reader
    // has decided to trust the message.
    expect(mail.subject).not.toContain("Robin");
  });
});

describe("passwordResetMail and emailConfirmationMail", () => {
  it("carry their link in text and HTML and say when it expires", () => {
    // common practice, no source
    const reset = passwordResetMail({ resetUrl: "https://visitwort.test/reset-password/abc", expiresAt });
    expect(reset.subject).toContain("Visitwort");
    expect(reset.text).toContain("https://visitwort.test/reset-password/abc");
    expect(reset.html).toContain('href="https://visitwort.test/reset-password/abc"');
    expect(reset.text).toContain("expires on 9 December 2026, 14:05 UTC");

    const confirm = emailConfirmationMail({ confirmUrl: "https://visitwort.test/confirm/xyz" });
    expect(confirm.text).toContain("https://visitwort.test/confirm/xyz");
    expect(confirm.html).toContain('href="https://visitwort.test/confirm/xyz"');
    expect(confirm.text).toMatch(/ignore it/);
  });

  it("refuse a link that is not a web address", () => {
    // OWASP Cross Site Scripting Prevention Cheat Sheet, "Framework Security": javascript: and
    // data: URLs need their own validation; attribute escaping does not make them safe.
    expect(() => emailConfirmationMail({ confirmUrl: "javascript:alert(1)" })).toThrow(/http\(s\)/);
  });
});

describe("formatExpiry", () => {
  it("names the time zone it wrote the time in", () => {
    // The IANA time zone database: Europe/Berlin is UTC+1 (CET) in December.
    expect(formatExpiry(expiresAt, "Europe/Berlin")).toBe("9 December 2026, 15:05 CET");
    expect(formatExpiry(expiresAt)).toBe("9 December 2026, 14:05 UTC");
  });
});
