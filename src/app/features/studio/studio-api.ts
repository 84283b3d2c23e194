import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { InviteDto, InvitePreviewDto, MemberDto, StudioDto } from '@shared/api/dto';
import type { Role } from '@shared/model/roles';

/** HTTP calls for studios, members and invites (the /api/studios and /api/invites routes). */
@Injectable({ providedIn: 'root' })
export class StudioApi {
  private readonly http = inject(HttpClient);

  async create(name: string): Promise<StudioDto> {
    return (await firstValueFrom(this.http.post<{ studio: StudioDto }>('/api/studios', { name }))).studio;
  }
  async get(studioId: string): Promise<StudioDto> {
    return (await firstValueFrom(this.http.get<{ studio: StudioDto }>(`/api/studios/${studioId}`))).studio;
  }
  async rename(studioId: string, name: string): Promise<StudioDto> {
    return (await firstValueFrom(this.http.patch<{ studio: StudioDto }>(`/api/studios/${studioId}`, { name }))).studio;
  }
  async remove(studioId: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/studios/${studioId}`));
  }
  async members(studioId: string): Promise<MemberDto[]> {
    return (await firstValueFrom(this.http.get<{ members: MemberDto[] }>(`/api/studios/${studioId}/members`))).members;
  }
  async changeRole(studioId: string, userId: string, role: Role): Promise<MemberDto> {
    return (await firstValueFrom(this.http.patch<{ member: MemberDto }>(`/api/studios/${studioId}/members/${userId}`, { role }))).member;
  }
  async removeMember(studioId: string, userId: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/studios/${studioId}/members/${userId}`));
  }
  async invites(studioId: string): Promise<InviteDto[]> {
    return (await firstValueFrom(this.http.get<{ invites: InviteDto[] }>(`/api/studios/${studioId}/invites`))).invites;
  }
  async invite(studioId: string, email: string, role: Role): Promise<InviteDto> {
    return (await firstValueFrom(this.http.post<{ invite: InviteDto }>(`/api/studios/${studioId}/invites`, { email, role }))).invite;
  }
  async revokeInvite(studioId: string, inviteId: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/studios/${studioId}/invites/${inviteId}`));
  }
  async previewInvite(token: string): Promise<InvitePreviewDto> {
    return (await firstValueFrom(this.http.get<{ invite: InvitePreviewDto }>(`/api/invites/${token}`))).invite;
  }
  async acceptInvite(token: string): Promise<StudioDto> {
    return (await firstValueFrom(this.http.post<{ studio: StudioDto }>(`/api/invites/${token}/accept`, {}))).studio;
  }
}
