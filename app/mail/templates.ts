/**
 * The e-mails Visitwort sends, as pure functions: the same input gives the same message, so
 * they can be tested without SMTP and previewed without a database. Every message has a plain
 * text part (some readers show nothing else) and an HTML part built from escaped values only.
 */
export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

export const MAIL_TEMPLATES = ["invitation", "password_reset", "email_confirmation", "determination_notice", "daily_digest"] as const;
export type MailTemplateName = (typeof MAIL_TEMPLATES)[number];

const HTML_ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/** For text and for double- or single-quoted attribute values alike. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (character) => HTML_ESCAPES[character]!);
}

// The links come from our own code, but a javascript: or data: URL in an e-mail would be a
// script in the reader's hands; refuse anything but a web address.
function webLink(url: string): string {
  const parsed = new URL(url);
  if (parsed.protocol !== "https:" && parsed.protocol !== "http:") {
    throw new Error(`Mail links must be http(s) URLs (got "${parsed.protocol}")`);
  }
  return url;
}

/**
 * The expiry in words with its time zone named: the server's zone means nothing to a reader
 * elsewhere, so it is UTC unless the caller knows the reader's zone.
 */
export function formatExpiry(expiresAt: Date, timeZone = "UTC"): string {
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "numeric",
    month: "long",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
    timeZoneName: "short",
  }).formatToParts(expiresAt);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? "";
  return `${part("day")} ${part("month")} ${part("year")}, ${part("hour")}:${part("minute")} ${part("timeZoneName")}`;
}

/** "a", "a and b", "a, b and c" */
function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join("");
  return `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}

const IGNORE_LINE = "If you did not expect this e-mail, you can ignore it: nothing changes until the link is used.";
const SIGNATURE = "Visitwort";

interface Layout {
  subject: string;
  /** Paragraphs before the link, plain text (escaped for the HTML part here). */
  before: string[];
  linkUrl: string;
  linkLabel: string;
  /** Paragraphs after the link. */
  after: string[];
  /** The small print; by default the line for mail somebody may not have asked for. */
  closing?: string;
}

function render({ subject, before, linkUrl, linkLabel, after, closing = IGNORE_LINE }: Layout): MailContent {
  const url = webLink(linkUrl);
  // The bare address stays on its own line in the text part: mail readers make it clickable,
  // and it can be copied when they do not.
  const text = [...before, `${linkLabel}:\n${url}`, ...after, closing, `— ${SIGNATURE}`].join("\n\n") + "\n";
  const paragraph = (content: string) => `<p style="margin:0 0 16px">${content}</p>`;
  const html = [
    "<!doctype html>",
    '<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width">',
    `<title>${escapeHtml(subject)}</title></head>`,
    '<body style="margin:0;padding:24px;font-family:system-ui,-apple-system,Segoe UI,Roboto,Arial,sans-serif;font-size:16px;line-height:1.5;color:#24231f;background:#f7f3ea">',
    ...before.map((p) => paragraph(escapeHtml(p))),
    paragraph(
      `<a href="${escapeHtml(url)}" style="display:inline-block;padding:10px 18px;background:#3f5e3a;color:#ffffff;text-decoration:none;border-radius:4px">${escapeHtml(linkLabel)}</a>`,
    ),
    // The same address written out, for readers that strip buttons or links.
    paragraph(`If the button does not work, copy this address into your browser:<br><span style="word-break:break-all">${escapeHtml(url)}</span>`),
    ...after.map((p) => paragraph(escapeHtml(p))),
    `<p style="margin:24px 0 0;color:#55524a;font-size:14px">${escapeHtml(closing)}<br>— ${escapeHtml(SIGNATURE)}</p>`,
    "</body></html>",
    "",
  ].join("\n");
  return { subject, text, html };
}

export interface InvitationMailInput {
  inviteUrl: string;
  /** Role names as the reader should see them, e.g. ["recorder", "coordinator"]. */
  roles: readonly string[];
  invitedByName: string;
  expiresAt: Date;
  timeZone?: string;
}

export function invitationMail({ inviteUrl, roles, invitedByName, expiresAt, timeZone }: InvitationMailInput): MailContent {
  const inviter = invitedByName.trim();
  const asRoles = roles.length ? ` as ${listInWords(roles)}` : "";
  return render({
    // No names in the subject: it is the part of a message shown to anyone who sees the inbox,
    // and a name chosen by a stranger should not be able to make it look like something else.
    subject: "You are invited to Visitwort",
    before: [
      "Hello,",
      `${inviter || "A coordinator"} invited you to join Visitwort${asRoles}. Visitwort collects the flower visits of bumble bees recorded in the field.`,
      "To accept, open the link below and choose your password.",
    ],
    linkUrl: inviteUrl,
    linkLabel: "Accept the invitation",
    after: [`The invitation expires on ${formatExpiry(expiresAt, timeZone)}. After that, ask for a new one.`],
  });
}

export interface PasswordResetMailInput {
  resetUrl: string;
  expiresAt: Date;
  timeZone?: string;
}

export function passwordResetMail({ resetUrl, expiresAt, timeZone }: PasswordResetMailInput): MailContent {
  return render({
    subject: "Reset your Visitwort password",
    before: ["Hello,", "Somebody asked to reset the password of your Visitwort account. To choose a new password, open the link below."],
    linkUrl: resetUrl,
    linkLabel: "Choose a new password",
    after: [
      `The link works once and expires on ${formatExpiry(expiresAt, timeZone)}.`,
      "Your current password keeps working until you choose a new one.",
    ],
  });
}

export interface EmailConfirmationMailInput {
  confirmUrl: string;
  expiresAt?: Date;
  timeZone?: string;
}

export function emailConfirmationMail({ confirmUrl, expiresAt, timeZone }: EmailConfirmationMailInput): MailContent {
  return render({
    subject: "Confirm your e-mail address for Visitwort",
    before: ["Hello,", "Please confirm that this is your e-mail address for Visitwort by opening the link below."],
    linkUrl: confirmUrl,
    linkLabel: "Confirm my e-mail address",
    after: expiresAt ? [`The link expires on ${formatExpiry(expiresAt, timeZone)}.`] : [],
  });
}

const NOTICE_CLOSING = "You get these notices because you recorded the visit. Choose one a day, or none, on your account page.";

/** One line of what happened to a visit, in words: "the plant was confirmed as Salix discolor". */
export interface DeterminationNotice {
  visitDate: string;
  subject: "plant" | "bee";
  outcome: "confirmed" | "corrected" | "cannot_be_determined";
  /** The name now standing, e.g. "Salix discolor" or "Bombus impatiens (queen)"; null when none. */
  name: string | null;
  identifiedBy: string;
  remarks: string;
}

export function describeNotice(notice: DeterminationNotice): string {
  const what = notice.subject === "plant" ? "the plant" : "the bee";
  const verdict =
    notice.outcome === "confirmed"
      ? `${notice.identifiedBy} confirmed ${what} as ${notice.name}`
      : notice.outcome === "corrected"
        ? `${notice.identifiedBy} corrected ${what} to ${notice.name ?? "an unnamed taxon"}`
        : `${notice.identifiedBy} could not determine ${what} from the photos`;
  return `Your visit of ${notice.visitDate}: ${verdict}${notice.remarks ? ` (“${notice.remarks}”)` : ""}.`;
}

export function determinationNoticeMail({ visitUrl, notice }: { visitUrl: string; notice: DeterminationNotice }): MailContent {
  return render({
    subject: notice.subject === "plant" ? "A botanist looked at your visit" : "A bee verifier looked at your visit",
    before: ["Hello,", describeNotice(notice)],
    linkUrl: visitUrl,
    linkLabel: "See the visit and its history",
    after: ["Thank you for recording it: verified visits are what the forage ranking is made of."],
    closing: NOTICE_CLOSING,
  });
}

export function dailyDigestMail({ visitsUrl, notices }: { visitsUrl: string; notices: DeterminationNotice[] }): MailContent {
  return render({
    subject: `${notices.length} ${notices.length === 1 ? "visit was" : "visits were"} looked at today`,
    before: ["Hello,", "Since yesterday's summary:", ...notices.map(describeNotice)],
    linkUrl: visitsUrl,
    linkLabel: "See your visits",
    after: [],
    closing: NOTICE_CLOSING,
  });
}
