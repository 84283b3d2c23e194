import type { Sequelize, Transaction } from 'sequelize';
import { sessionCache } from '../../core/session';

/**
 * Ends every stored session of an account except `keepSid` (security item 28 in the README):
 * passport keeps the account at sess.passport.user (its id, or an object with the id) in
 * connect-pg-simple's table.
 */
export async function endSessionsOf(
  sequelize: Sequelize,
  userId: string,
  keepSid: string | null,
  transaction?: Transaction,
): Promise<number> {
  sessionCache.forgetUser(userId, keepSid);
  const [, result] = (await sequelize.query(
    `DELETE FROM sessions WHERE coalesce(sess->'passport'->'user'->>'id', sess->'passport'->>'user') = $1 AND sid <> $2`,
    {
      bind: [userId, keepSid ?? ''],
      transaction,
    },
  )) as [unknown, { rowCount: number }];
  // A read that raced the DELETE may have cached a doomed session: forget again once it holds.
  if (transaction) transaction.afterCommit(() => sessionCache.forgetUser(userId, keepSid));
  else sessionCache.forgetUser(userId, keepSid);
  return result?.rowCount ?? 0;
}
