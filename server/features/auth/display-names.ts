import type { Transaction } from 'sequelize';
import { User } from './user.model';

/**
 * Display names by user id, for the "by whom" of lists and feeds (ids of deleted accounts and
 * nulls are left out). Inside a transaction it must be given, so a request holds one connection
 * at most.
 */
export async function displayNames(ids: readonly (string | null)[], transaction?: Transaction): Promise<Map<string, string>> {
  const list = [...new Set(ids.filter((i): i is string => !!i))];
  const users = list.length ? await User.findAll({ where: { id: list }, attributes: ['id', 'displayName'], transaction }) : [];
  return new Map(users.map((u) => [u.id, u.displayName]));
}
