// Mail templates: pure functions that turn what a feature wants to say into a plain-text body and a
// simple HTML body, both carrying the product name, the link to act on, and the safety caution.
// No I/O; the caller enqueues the result (`mail.enqueue({ to, kind, related, ...renderMail(...) })`).

export const productName = 'Cagewright';
export const productLine = 'Cagewright · roll cage pre-checks for club motorsport';
export const safetyCaution =
  "Cagewright gives a pre-check only. The sanctioning body's inspector decides whether a cage passes. " +
  'Welding and fabrication belong to qualified people working under local rules.';

export interface MailContent {
  subject: string;
  /** The first line, e.g. "Hello Robin,". */
  greeting: string;
  /** Paragraphs of plain text; blank ones are dropped. */
  paragraphs: string[];
  /** The one thing to do next. Must be an http(s) address. */
  action?: { label: string; url: string };
  /** Why the person gets this mail ("You are a steward of Tarnwick Vale MC."). */
  reason?: string;
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

export class MailTemplateError extends Error {
  override name = 'MailTemplateError';
}

const htmlEscapes: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => htmlEscapes[c]!);
}

/** A subject is one line: newlines would let text reach other headers. */
function oneLine(value: string): string {
  return value.replace(/\s+/g, ' ').trim();
}

function checkedUrl(url: string): string {
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    throw new MailTemplateError(`Not an address: ${url}`);
  }
  if (parsed.protocol !== 'https:' && parsed.protocol !== 'http:') {
    throw new MailTemplateError(`Only http(s) links go into mails, not ${parsed.protocol}`);
  }
  return parsed.toString();
}

export function renderMail(content: MailContent): RenderedMail {
  const subject = oneLine(content.subject);
  if (!subject) throw new MailTemplateError('A mail needs a subject');
  const paragraphs = content.paragraphs.map((p) => p.trim()).filter(Boolean);
  const action = content.action
    ? { label: oneLine(content.action.label), url: checkedUrl(content.action.url) }
    : null;
  const reason = content.reason?.trim();

  const text = [
    content.greeting.trim(),
    ...paragraphs,
    ...(action ? [`${action.label}: ${action.url}`] : []),
    ['--', productLine, safetyCaution, ...(reason ? [reason] : [])].join('\n'),
  ]
    .filter(Boolean)
    .join('\n\n');

  const p = (body: string, style = 'margin:0 0 1em') => `<p style="${style}">${body}</p>`;
  const html = [
    '<!doctype html>',
    '<html><body style="font-family:sans-serif;font-size:15px;line-height:1.5;color:#161b22">',
    p(escapeHtml(content.greeting.trim())),
    ...paragraphs.map((x) => p(escapeHtml(x))),
    ...(action ? [p(`<a href="${escapeHtml(action.url)}">${escapeHtml(action.label)}</a>`)] : []),
    '<hr style="border:none;border-top:1px solid #ccd">',
    p(
      `<strong>${escapeHtml(productName)}</strong> · roll cage pre-checks for club motorsport`,
      'margin:0 0 0.5em;font-size:13px',
    ),
    p(escapeHtml(safetyCaution), 'margin:0 0 0.5em;font-size:13px'),
    ...(reason ? [p(escapeHtml(reason), 'margin:0;font-size:13px;color:#555')] : []),
    '</body></html>',
  ].join('\n');

  return { subject, text, html };
}
