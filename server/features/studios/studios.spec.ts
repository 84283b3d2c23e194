import { Membership } from './membership.model';
import { createHarness, TestClient, type Harness } from '../../testing/harness';

let h: Harness;
beforeAll(async () => {
  h = await createHarness();
});
afterAll(() => h.close());

async function ownerWithStudio() {
  const owner = new TestClient(h.app);
  const account = await owner.signUp('owner password 1', 'owner');
  const res = await owner.post('/api/studios', { name: 'Test Foundry' });
  expect(res.status).toBe(201);
  expect(res.body.studio.role).toBe('owner');
  return { owner, account, studioId: res.body.studio.id as string };
}

test('invite by e-mail → the invitee accepts from the mailed link and joins with that role', async () => {
  const { owner, studioId } = await ownerWithStudio();
  const invitee = new TestClient(h.app);
  const { email, id } = await invitee.signUp('invitee password', 'invitee');
  const since = h.mail.messages.length;
  const sent = await owner.post(`/api/studios/${studioId}/invites`, { email, role: 'editor' });
  expect(sent.status).toBe(201);
  const mail = await h.mail.waitFor(email, 5000, since);
  expect(mail.text).toContain('«Test Foundry»');
  const token = mail.text.match(/\/invites\/([A-Za-z0-9_-]+)/)![1];
  const preview = await new TestClient(h.app).get(`/api/invites/${token}`);
  expect(preview.body.invite).toMatchObject({ studioName: 'Test Foundry', role: 'editor', email, expired: false, accepted: false });
  expect(preview.headers['referrer-policy']).toBe('no-referrer');
  const accepted = await invitee.post(`/api/invites/${token}/accept`);
  expect(accepted.status).toBe(200);
  expect(accepted.body.studio).toMatchObject({ id: studioId, role: 'editor' });
  expect((await Membership.findOne({ where: { studioId, userId: id } }))?.role).toBe('editor');
  expect((await invitee.post(`/api/invites/${token}/accept`)).status).toBe(410);
  // Once accepted, the link shows nothing of the studio or the invitee (issue "Hardening", item 14).
  expect((await new TestClient(h.app).get(`/api/invites/${token}`)).body.invite).toEqual({ accepted: true });
  const pending = await owner.get(`/api/studios/${studioId}/invites`);
  expect(pending.body.invites).toEqual([]);
});

test('an invite cannot be accepted by an account with another e-mail', async () => {
  const { owner, studioId } = await ownerWithStudio();
  const intended = new TestClient(h.app);
  const { email } = await intended.signUp('x password 1', 'intended');
  const since = h.mail.messages.length;
  await owner.post(`/api/studios/${studioId}/invites`, { email, role: 'owner' });
  const token = (await h.mail.waitFor(email, 5000, since)).text.match(/\/invites\/([A-Za-z0-9_-]+)/)![1];
  const stranger = new TestClient(h.app);
  await stranger.signUp('y password 1', 'stranger');
  const res = await stranger.post(`/api/invites/${token}/accept`);
  expect(res.status).toBe(403);
  expect(res.body.error.code).toBe('invite_other_email');
});

test('inviting an existing member is a conflict', async () => {
  const { owner, account, studioId } = await ownerWithStudio();
  const res = await owner.post(`/api/studios/${studioId}/invites`, { email: account.email, role: 'viewer' });
  expect(res.status).toBe(409);
});

test('the last owner can neither leave nor be demoted; with a second owner both work', async () => {
  const { owner, account, studioId } = await ownerWithStudio();
  const leave = await owner.delete(`/api/studios/${studioId}/members/${account.id}`);
  expect(leave.status).toBe(409);
  expect(leave.body.error.code).toBe('last_owner');
  const demote = await owner.patch(`/api/studios/${studioId}/members/${account.id}`, { role: 'editor' });
  expect(demote.status).toBe(409);

  const second = new TestClient(h.app);
  const other = await second.signUp('second owner pw', 'second');
  await Membership.create({ studioId, userId: other.id, role: 'viewer' });
  expect((await owner.patch(`/api/studios/${studioId}/members/${other.id}`, { role: 'owner' })).status).toBe(200);
  expect((await owner.patch(`/api/studios/${studioId}/members/${account.id}`, { role: 'editor' })).status).toBe(200);
  // Now an editor: may leave (remove self) but not remove others.
  expect((await owner.delete(`/api/studios/${studioId}/members/${other.id}`)).status).toBe(403);
  expect((await owner.delete(`/api/studios/${studioId}/members/${account.id}`)).status).toBe(204);
  expect((await owner.get(`/api/studios/${studioId}`)).status).toBe(404);
});

test('a role change or a removal holds from the very next request, though roles are read through a cache', async () => {
  const { owner, studioId } = await ownerWithStudio();
  const member = new TestClient(h.app);
  const account = await member.signUp('member password 1', 'member');
  await Membership.create({ studioId, userId: account.id, role: 'viewer' });
  const artworks = `/api/studios/${studioId}/artworks`;
  // Reads warm the cache with the viewer role; a viewer may not upload-rename-delete.
  expect((await member.get(artworks)).status).toBe(200);
  expect((await member.post(`/api/studios/${studioId}/timings`, {})).status).toBe(403);
  expect((await owner.patch(`/api/studios/${studioId}/members/${account.id}`, { role: 'editor' })).status).toBe(200);
  // Promoted: the editor-only route now gets past the policy to body validation (400, not 403).
  expect((await member.post(`/api/studios/${studioId}/timings`, {})).status).toBe(400);
  expect((await owner.delete(`/api/studios/${studioId}/members/${account.id}`)).status).toBe(204);
  expect((await member.get(artworks)).status).toBe(404);
  // A member added outside the API (any Sequelize write) is seen at once too.
  await Membership.create({ studioId, userId: account.id, role: 'viewer' });
  expect((await member.get(artworks)).status).toBe(200);
  expect((await owner.delete(`/api/studios/${studioId}`)).status).toBe(204);
  expect((await member.get(artworks)).status).toBe(404);
});

test('a user in several studios lists each with its role', async () => {
  const { owner, studioId } = await ownerWithStudio();
  const second = await owner.post('/api/studios', { name: 'Another Bench' });
  const list = await owner.get('/api/studios');
  expect(list.body.studios.map((s: { id: string }) => s.id).sort()).toEqual([studioId, second.body.studio.id].sort());
});

test('bad ids answer 404, bad bodies 400 with the field path', async () => {
  const { owner, studioId } = await ownerWithStudio();
  expect((await owner.get('/api/studios/not-a-uuid')).status).toBe(404);
  expect((await owner.patch(`/api/studios/${studioId}/members/nope`, { role: 'viewer' })).status).toBe(404);
  const bad = await owner.post(`/api/studios/${studioId}/invites`, { email: 'not-an-email', role: 'boss' });
  expect(bad.status).toBe(400);
  const paths = bad.body.error.details.issues.map((i: { path: string }) => i.path);
  expect(paths).toEqual(expect.arrayContaining(['email', 'role']));
});
