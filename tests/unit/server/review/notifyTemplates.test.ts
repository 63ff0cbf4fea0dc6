import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resetConfigCache } from '../../../../server/config';
import { approvedMail, returnedMail, sheetPublishedMail, submittedMail } from '../../../../server/services/notify.service';

const ENV = {
  DB_PASSWORD: 'unit-test-password',
  JWT_SECRET: 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw',
  APP_URL: 'http://gw.example.test:5180',
};
const saved: Record<string, string | undefined> = {};

beforeAll(() => {
  for (const [key, value] of Object.entries(ENV)) {
    saved[key] = process.env[key];
    process.env[key] = value;
  }
  resetConfigCache();
});
afterAll(() => {
  for (const key of Object.keys(ENV)) {
    if (saved[key] === undefined) delete process.env[key];
    else process.env[key] = saved[key];
  }
  resetConfigCache();
});

const to = { email: 'reviewer@example.test', name: 'Sunniva <Halloran>' };
const ref = { revisionId: 17, number: 2, designId: 5, designName: 'Bench "dispensing" stage' };

describe('review mails', () => {
  it('when a revision is submitted, then the reviewer mail links to the review page in both parts', () => {
    const mail = submittedMail(to, { ...ref, authorName: 'Maren' });
    expect(mail.subject).toBe('Review requested: Bench "dispensing" stage, revision 2');
    expect(mail.text).toContain('http://gw.example.test:5180/review/17');
    expect(mail.html).toContain('href="http://gw.example.test:5180/review/17"');
    expect(mail.text).toContain('Maren submitted revision 2');
  });

  it('when names carry HTML, then the HTML part escapes them and the text part keeps them', () => {
    const mail = submittedMail(to, { ...ref, authorName: 'Maren' });
    expect(mail.html).toContain('Sunniva &lt;Halloran&gt;');
    expect(mail.html).toContain('Bench &quot;dispensing&quot; stage');
    expect(mail.html).not.toContain('<Halloran>');
    expect(mail.text).toContain('Hello Sunniva <Halloran>,');
  });

  it('when returned, then the reason is quoted in both parts and the link opens the design', () => {
    const mail = returnedMail(to, { ...ref, reviewerName: 'Sunniva', reason: 'Lower the acceleration.\nCheck racking.' });
    expect(mail.text).toContain('  > Lower the acceleration.\n  > Check racking.');
    expect(mail.html).toContain('Lower the acceleration.\nCheck racking.</blockquote>');
    expect(mail.text).toContain('http://gw.example.test:5180/designs/5');
  });

  it('when approved, then the designer gets the comment and the sheet link; without a comment there is no quote', () => {
    const withComment = approvedMail(to, { ...ref, reviewerName: 'Sunniva', comment: 'Fine.', sheetId: 9 });
    const without = approvedMail(to, { ...ref, reviewerName: 'Sunniva', comment: '', sheetId: 9 });
    expect(withComment.text).toContain('Comment:\n  > Fine.');
    expect(withComment.text).toContain('http://gw.example.test:5180/sheets/9');
    expect(without.html).not.toContain('<blockquote');
  });

  it('when a sheet is published, then makers get its link and the SHA-256 of the A4 file', () => {
    const mail = sheetPublishedMail(to, { ...ref, sheetId: 9, sha256: 'ab'.repeat(32) });
    expect(mail.subject).toBe('New design sheet: Bench "dispensing" stage, revision 2');
    expect(mail.text).toContain('ab'.repeat(32));
    expect(mail.html).toContain('href="http://gw.example.test:5180/sheets/9"');
  });
});
