import { describe, expect, it } from 'vitest';
import { mailTemplates } from './mail-templates';

describe('mail templates', () => {
  it('name the firm in text and HTML and carry the link', () => {
    const m = mailTemplates.invitation({
      to: 'a@b.example',
      firm: 'Northfold Engineering',
      invitedBy: 'Ada',
      roles: ['checker'],
      url: 'http://127.0.0.1:3000/accept-invitation?token=t',
      expires: new Date(0),
    });
    expect(m.subject).toContain('Northfold Engineering');
    expect(m.text).toContain('http://127.0.0.1:3000/accept-invitation?token=t');
    expect(m.html).toContain('Northfold Engineering');
  });

  it('escapes HTML in values', () => {
    const m = mailTemplates.sheetEvent({
      to: 'a@b.example',
      firm: 'F & <Co>',
      subject: 'Check requested',
      sentence: 'P asks you to check <script>.',
      url: 'http://x',
    });
    expect(m.html).not.toContain('<script>');
    expect(m.html).toContain('F &amp; &lt;Co&gt;');
  });
});
