import { signDownload, verifyDownload } from './signed-links';

const link = { key: 'exports/1/sheet.png', fileName: 'Sheet.png', contentType: 'image/png', expiresAt: 1_000_000 };

describe('signed download links', () => {
  it('give back what was signed until they expire', () => {
    expect(verifyDownload('secret', signDownload('secret', link), 999_999)).toEqual(link);
  });
  it('answer 410 once expired', () => {
    expect(() => verifyDownload('secret', signDownload('secret', link), 1_000_001)).toThrow(
      expect.objectContaining({ status: 410, code: 'link_expired' }),
    );
  });
  it('answer 404 for another secret, a changed payload or a changed signature', () => {
    const token = signDownload('secret', link);
    const [body, sig] = token.split('.');
    const longer = Buffer.from(JSON.stringify({ ...link, expiresAt: 9e15 })).toString('base64url');
    for (const bad of [signDownload('other', link), `${longer}.${sig}`, `${body}.${sig.slice(0, -2)}AA`, body, '', 'a.b.c']) {
      expect(() => verifyDownload('secret', bad, 0)).toThrow(expect.objectContaining({ status: 404 }));
    }
  });
});
