import { createHmac, timingSafeEqual } from 'node:crypto';
import { AppError } from './app-error';

/** What a signed download link serves: a blob, named and typed, until it expires. */
export interface SignedDownload {
  key: string;
  fileName: string;
  contentType: string;
  /** Milliseconds since the epoch. */
  expiresAt: number;
}

const b64 = (b: Buffer | string) => Buffer.from(b).toString('base64url');
const mac = (secret: string, body: string) => createHmac('sha256', secret).update(`download:${body}`).digest();

/** A token for /api/downloads/<token>: the payload in base64url, then its HMAC-SHA256 under the app's secret. */
export function signDownload(secret: string, d: SignedDownload): string {
  const body = b64(JSON.stringify(d));
  return `${body}.${b64(mac(secret, body))}`;
}

/** The download a token stands for; 404 for a token that was not made here (or was changed), 410 once it has expired. */
export function verifyDownload(secret: string, token: string, now = Date.now()): SignedDownload {
  const [body, sig] = token.split('.');
  const given = Buffer.from(sig ?? '', 'base64url');
  const expected = mac(secret, body ?? '');
  if (!body || given.length !== expected.length || !timingSafeEqual(given, expected))
    throw new AppError(404, 'not_found', 'This download link is not valid. Open the export in Emberline to download it.');
  const d = JSON.parse(Buffer.from(body, 'base64url').toString('utf8')) as SignedDownload;
  if (now > d.expiresAt)
    throw new AppError(410, 'link_expired', 'This download link has expired. Open the export in Emberline again for a fresh one.');
  return d;
}
