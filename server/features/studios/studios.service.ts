import { Op, type Transaction } from 'sequelize';
import type { InviteDto, InvitePreviewDto, MemberDto, StudioDto } from '@shared/api/dto';
import type { Role } from '@shared/model/roles';
import { AppError, conflict, notFound } from '../../core/app-error';
import { hashToken, newToken } from '../../core/tokens';
import type { MailOutbox } from '../../mail/outbox';
import { record } from '../activity/activity.model';
import { Artwork } from '../artworks/artwork.model';
import { User } from '../auth/user.model';
import { Invite } from './invite.model';
import { Membership } from './membership.model';
import { Studio } from './studio.model';

/** Refuses studio work to an account that has not proven its address (security item 27). */
function assertVerified(user: Express.User, what: string): void {
  if (!user.emailVerified) {
    throw new AppError(
      403,
      'email_unverified',
      `Confirm your e-mail address before you ${what}: open the link we mailed you, or ask for a new one.`,
    );
  }
}

/** How long an invite link works. */
export const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;

const studioDto = (studio: Studio, role: Role): StudioDto => ({
  id: studio.id,
  name: studio.name,
  role,
  createdAt: studio.createdAt.toISOString(),
});

const inviteDto = (i: Invite): InviteDto => ({
  id: i.id,
  email: i.email,
  role: i.role,
  expiresAt: i.expiresAt.toISOString(),
  createdAt: i.createdAt.toISOString(),
});

/** A studio's name, or null when it is gone (what a share link's page says the look is from). */
export async function studioName(studioId: string): Promise<string | null> {
  return (await Studio.findByPk(studioId, { attributes: ['name'] }))?.name ?? null;
}

/** Studios, their members and invitations. */
export class StudiosService {
  constructor(
    private readonly outbox: MailOutbox,
    private readonly appUrl: string,
    /** Called after a studio is deleted, with what to clean up outside the database. */
    private readonly afterDelete: (studioId: string, artworkIds: string[]) => Promise<void> = async () => undefined,
    /** Called before a studio is deleted, while its rows still say what belongs to it. */
    private readonly beforeDelete: (studioId: string) => Promise<unknown> = async () => undefined,
  ) {}

  async listForUser(userId: string): Promise<StudioDto[]> {
    const memberships = await Membership.findAll({ where: { userId }, include: [{ model: Studio, as: 'studio' }] });
    return memberships.map((m) => studioDto(m.studio!, m.role)).sort((a, b) => a.name.localeCompare(b.name));
  }

  async create(user: Express.User, name: string): Promise<StudioDto> {
    assertVerified(user, 'create a studio');
    const userId = user.id;
    return Studio.sequelize!.transaction(async (transaction) => {
      const studio = await Studio.create({ name }, { transaction });
      await Membership.create({ studioId: studio.id, userId, role: 'owner' }, { transaction });
      return studioDto(studio, 'owner');
    });
  }

  async get(studioId: string, role: Role): Promise<StudioDto> {
    const studio = await Studio.findByPk(studioId);
    if (!studio) throw notFound('The studio');
    return studioDto(studio, role);
  }

  async rename(studioId: string, name: string, role: Role): Promise<StudioDto> {
    const studio = await Studio.findByPk(studioId);
    if (!studio) throw notFound('The studio');
    await studio.update({ name });
    return studioDto(studio, role);
  }

  async remove(studioId: string): Promise<void> {
    const artworks = await Artwork.findAll({ attributes: ['id'], where: { studioId } });
    await this.beforeDelete(studioId);
    await Studio.destroy({ where: { id: studioId } });
    await this.afterDelete(
      studioId,
      artworks.map((a) => a.id),
    );
  }

  async members(studioId: string): Promise<MemberDto[]> {
    const rows = await Membership.findAll({ where: { studioId }, include: [{ model: User, as: 'user' }], order: [['createdAt', 'ASC']] });
    return rows.map((m) => ({
      userId: m.userId,
      email: m.user!.email,
      displayName: m.user!.displayName,
      role: m.role,
      joinedAt: m.createdAt.toISOString(),
    }));
  }

  /** Changes a member's role; the studio always keeps at least one owner. */
  async changeRole(studioId: string, userId: string, role: Role, actorId?: string): Promise<MemberDto> {
    await Membership.sequelize!.transaction(async (transaction) => {
      const member = await this.lockedMember(studioId, userId, transaction);
      if (member.role === 'owner' && role !== 'owner') await this.assertAnotherOwner(studioId, userId, transaction);
      const user = await User.findByPk(userId, { transaction });
      await member.update({ role }, { transaction });
      await record(studioId, actorId ?? null, 'member.role', `changed ${user?.displayName ?? 'a member'}'s role to ${role}`, transaction);
    });
    return (await this.members(studioId)).find((m) => m.userId === userId)!;
  }

  /** Removes a member (an owner removing someone, or anyone leaving); never the last owner. */
  async removeMember(studioId: string, userId: string, actorId?: string): Promise<void> {
    await Membership.sequelize!.transaction(async (transaction) => {
      const member = await this.lockedMember(studioId, userId, transaction);
      if (member.role === 'owner') await this.assertAnotherOwner(studioId, userId, transaction);
      const user = await User.findByPk(userId, { transaction });
      await member.destroy({ transaction });
      const self = actorId === userId;
      await record(
        studioId,
        actorId ?? null,
        self ? 'member.left' : 'member.removed',
        self ? 'left the studio' : `removed ${user?.displayName ?? 'a member'}`,
        transaction,
      );
    });
  }

  async pendingInvites(studioId: string): Promise<InviteDto[]> {
    const rows = await Invite.findAll({
      where: { studioId, acceptedAt: { [Op.is]: null }, expiresAt: { [Op.gt]: new Date() } },
      order: [['createdAt', 'DESC']],
    });
    return rows.map(inviteDto);
  }

  async invite(studioId: string, invitedBy: Express.User, email: string, role: Role): Promise<InviteDto> {
    const existingUser = await User.findOne({ where: { email } });
    if (existingUser && (await Membership.findOne({ where: { studioId, userId: existingUser.id } }))) {
      throw conflict('already_member', `${email} is already a member of this studio.`);
    }
    const studio = await Studio.findByPk(studioId);
    if (!studio) throw notFound('The studio');
    const { token, hash } = newToken();
    const invite = await Invite.create({
      studioId,
      email,
      role,
      tokenHash: hash,
      invitedById: invitedBy.id,
      expiresAt: new Date(Date.now() + INVITE_TTL_MS),
    });
    const link = `${this.appUrl}/invites/${token}`;
    // Names typed by users are quoted as data, never in the subject (security item 31).
    const queued = await this.outbox.post(
      'invite',
      {
        to: email,
        subject: 'An invitation to a studio on Emberline',
        text: `Hello,\n\nan Emberline user invites you to join a studio as ${role}.\n\n  Studio name (as written by its owner): «${studio.name}»\n  Invited by (as written by that user): «${invitedBy.displayName}»\n\nOpen this link within 7 days to accept (sign in or create an account with ${email}):\n\n${link}\n\nIf you do not know this studio, ignore this message.\n`,
      },
      invitedBy.id,
    );
    if (!queued)
      throw new AppError(
        429,
        'mail_throttled',
        `${email} has received as many mails from Emberline as we send in an hour. Try again later.`,
      );
    await record(studioId, invitedBy.id, 'invite.sent', `invited ${email} as ${role}`);
    return inviteDto(invite);
  }

  async revokeInvite(studioId: string, inviteId: string): Promise<void> {
    const count = await Invite.destroy({ where: { id: inviteId, studioId, acceptedAt: { [Op.is]: null } } });
    if (count === 0) throw notFound('The invite');
  }

  async previewInvite(token: string): Promise<InvitePreviewDto> {
    const invite = await Invite.findOne({ where: { tokenHash: hashToken(token) }, include: [{ model: Studio, as: 'studio' }] });
    if (!invite) throw notFound('The invite');
    // Once accepted, the link shows nothing of the studio or the invitee.
    if (invite.acceptedAt) return { accepted: true };
    return {
      studioName: invite.studio!.name,
      role: invite.role,
      email: invite.email,
      expired: invite.expiresAt.getTime() < Date.now(),
      accepted: false,
    };
  }

  /** Accepts an invite for the signed-in user, whose e-mail must be the invited one. */
  async acceptInvite(token: string, user: Express.User): Promise<StudioDto> {
    return Invite.sequelize!.transaction(async (transaction) => {
      const invite = await Invite.findOne({ where: { tokenHash: hashToken(token) }, lock: transaction.LOCK.UPDATE, transaction });
      if (!invite) throw notFound('The invite');
      if (invite.acceptedAt) throw new AppError(410, 'invite_used', 'This invite was already accepted.');
      if (invite.expiresAt.getTime() < Date.now())
        throw new AppError(410, 'invite_expired', 'This invite has expired. Ask the studio owner for a new one.');
      if (invite.email !== user.email) {
        throw new AppError(403, 'invite_other_email', `This invite is for ${invite.email}. Sign in with that e-mail to accept it.`);
      }
      // The invite's link was mailed to this address: opening it proves the mailbox (security item 27).
      if (!user.emailVerified) await User.update({ emailVerifiedAt: new Date() }, { where: { id: user.id }, transaction });
      const existing = await Membership.findOne({ where: { studioId: invite.studioId, userId: user.id }, transaction });
      if (!existing) {
        await Membership.create({ studioId: invite.studioId, userId: user.id, role: invite.role }, { transaction });
        await record(invite.studioId, user.id, 'member.joined', `joined as ${invite.role}`, transaction);
      }
      await invite.update({ acceptedAt: new Date() }, { transaction });
      const studio = await Studio.findByPk(invite.studioId, { transaction });
      return studioDto(studio!, existing?.role ?? invite.role);
    });
  }

  private async lockedMember(studioId: string, userId: string, transaction: Transaction): Promise<Membership> {
    // Lock every membership row of the studio so two concurrent demotions cannot leave no owner.
    const rows = await Membership.findAll({ where: { studioId }, lock: transaction.LOCK.UPDATE, transaction });
    const member = rows.find((m) => m.userId === userId);
    if (!member) throw notFound('The member');
    return member;
  }

  private async assertAnotherOwner(studioId: string, userId: string, transaction: Transaction): Promise<void> {
    const others = await Membership.count({ where: { studioId, role: 'owner', userId: { [Op.ne]: userId } }, transaction });
    if (others === 0) throw conflict('last_owner', 'A studio needs at least one owner. Make someone else an owner first.');
  }
}
