// Mail templates: every mail carries the product name, its link and the safety caution in both parts;
// text is escaped in HTML, subjects stay on one line, and only http(s) links are accepted.
import { describe, expect, test } from 'vitest';
import {
  escapeHtml,
  MailTemplateError,
  renderMail,
  safetyCaution,
  type MailContent,
} from '../../../backend/src/services/mail/templates';

const base: MailContent = {
  subject: 'Steward decision on your report',
  greeting: 'Hello Robin,',
  paragraphs: ['Imogen Feld accepted the pre-check report for "Escort Mk2 clubman".'],
  action: { label: 'Open the report', url: 'https://cagewright.example/reports/42' },
};

describe('renderMail', () => {
  test('the text part: greeting, paragraphs, link, then the footer with product and caution', () => {
    const { subject, text } = renderMail({
      ...base,
      reason: 'You are a builder in Tarnwick Vale Motor Club.',
    });
    expect(subject).toBe('Steward decision on your report');
    expect(text).toBe(
      [
        'Hello Robin,',
        'Imogen Feld accepted the pre-check report for "Escort Mk2 clubman".',
        'Open the report: https://cagewright.example/reports/42',
        `--\nCagewright · roll cage pre-checks for club motorsport\n${safetyCaution}\nYou are a builder in Tarnwick Vale Motor Club.`,
      ].join('\n\n'),
    );
  });

  test('the caution is the one the product states everywhere', () => {
    expect(safetyCaution).toBe(
      "Cagewright gives a pre-check only. The sanctioning body's inspector decides whether a cage passes. " +
        'Welding and fabrication belong to qualified people working under local rules.',
    );
  });

  test.each<[string, Partial<MailContent>]>([
    ['with a link', {}],
    ['without a link', { action: undefined }],
    ['with blank paragraphs', { paragraphs: ['', '  ', 'Only this one.'] }],
  ])('both parts carry the product name and the caution (%s)', (_label, change) => {
    const { text, html } = renderMail({ ...base, ...change });
    expect(text).toContain('Cagewright · roll cage pre-checks for club motorsport');
    expect(text).toContain(safetyCaution);
    expect(html).toContain('<strong>Cagewright</strong>');
    // The caution's apostrophe is escaped in HTML.
    expect(html).toContain(escapeHtml(safetyCaution));
    expect(text).not.toMatch(/\n{3,}/);
  });

  test('the HTML part escapes what people typed and links the action', () => {
    const { html } = renderMail({
      ...base,
      greeting: 'Hello <Robin>,',
      paragraphs: ['Car "Escort" & <script>alert(1)</script>'],
    });
    expect(html).toContain('<p style="margin:0 0 1em">Hello &lt;Robin&gt;,</p>');
    expect(html).toContain('Car &quot;Escort&quot; &amp; &lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).not.toContain('<script>');
    expect(html).toContain('<a href="https://cagewright.example/reports/42">Open the report</a>');
    expect(html).toContain(escapeHtml(safetyCaution));
  });

  test('a subject with line breaks becomes one line (no header injection)', () => {
    expect(renderMail({ ...base, subject: 'Decision\r\nBcc: everyone@example.org' }).subject).toBe(
      'Decision Bcc: everyone@example.org',
    );
  });

  test.each([
    ['javascript:alert(1)', /Only http\(s\) links/],
    ['mailto:x@y.example', /Only http\(s\) links/],
    ['not a url', /Not an address/],
  ])('refuses the link %s', (url, message) => {
    expect(() => renderMail({ ...base, action: { label: 'Open', url } })).toThrow(MailTemplateError);
    expect(() => renderMail({ ...base, action: { label: 'Open', url } })).toThrow(message);
  });

  test('refuses an empty subject', () => {
    expect(() => renderMail({ ...base, subject: ' \n ' })).toThrow('A mail needs a subject');
  });
});

describe('escapeHtml', () => {
  test.each([
    ['a & b', 'a &amp; b'],
    ['<b>', '&lt;b&gt;'],
    [`"it's"`, '&quot;it&#39;s&quot;'],
    ['plain', 'plain'],
  ])('%s → %s', (input, output) => {
    expect(escapeHtml(input)).toBe(output);
  });
});
