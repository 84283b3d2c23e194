import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { ActivityDto, PresetDto, PresetRevisionDto, SharedViewDto, ShareLinkDto } from '@shared/api/dto';
import type { PresetDocument } from '@shared/api/preset.schema';
import type { RenderDto } from '@shared/api/render.schema';
import type { PanelParams } from '@shared/model/parameters';
import { unpackFrames } from '@shared/pipeline/frames';
import type { Frame } from '@shared/pipeline/types';

/** HTTP calls for studio presets, their revisions, links, and the activity feed. */
@Injectable({ providedIn: 'root' })
export class PresetApi {
  private readonly http = inject(HttpClient);
  private readonly base = (studioId: string) => `/api/studios/${studioId}/presets`;

  async list(
    studioId: string,
    q: { panelTypeId?: string; q?: string; sort?: string; page?: number; pageSize?: number },
  ): Promise<{ presets: PresetDto[]; total: number }> {
    const params = Object.fromEntries(
      Object.entries(q)
        .filter(([, v]) => v !== undefined && v !== '')
        .map(([k, v]) => [k, String(v)]),
    );
    return firstValueFrom(this.http.get<{ presets: PresetDto[]; total: number }>(this.base(studioId), { params }));
  }
  async get(studioId: string, id: string): Promise<PresetDto> {
    return (await firstValueFrom(this.http.get<{ preset: PresetDto }>(`${this.base(studioId)}/${id}`))).preset;
  }
  async create(studioId: string, body: { name: string; panelTypeId: string; parameters?: PanelParams }): Promise<PresetDto> {
    return (await firstValueFrom(this.http.post<{ preset: PresetDto }>(this.base(studioId), body))).preset;
  }
  async save(
    studioId: string,
    id: string,
    body: { baseRevision: number; name?: string; parameters?: PanelParams; message?: string },
  ): Promise<PresetDto> {
    return (await firstValueFrom(this.http.patch<{ preset: PresetDto }>(`${this.base(studioId)}/${id}`, body))).preset;
  }
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}`));
  }
  async revisions(studioId: string, id: string): Promise<PresetRevisionDto[]> {
    return (await firstValueFrom(this.http.get<{ revisions: PresetRevisionDto[] }>(`${this.base(studioId)}/${id}/revisions`))).revisions;
  }
  async restore(studioId: string, id: string, revision: number): Promise<PresetDto> {
    return (await firstValueFrom(this.http.post<{ preset: PresetDto }>(`${this.base(studioId)}/${id}/revisions/${revision}/restore`, {})))
      .preset;
  }
  async duplicate(studioId: string, id: string, targetStudioId: string): Promise<PresetDto> {
    return (
      await firstValueFrom(this.http.post<{ preset: PresetDto }>(`${this.base(studioId)}/${id}/duplicate`, { studioId: targetStudioId }))
    ).preset;
  }
  async setReference(studioId: string, id: string, isReference: boolean): Promise<PresetDto> {
    return (await firstValueFrom(this.http.post<{ preset: PresetDto }>(`${this.base(studioId)}/${id}/reference`, { isReference }))).preset;
  }
  async exportDocument(studioId: string, id: string): Promise<PresetDocument> {
    return firstValueFrom(this.http.get<PresetDocument>(`${this.base(studioId)}/${id}/export`));
  }
  async importDocument(studioId: string, doc: unknown): Promise<PresetDto> {
    return (await firstValueFrom(this.http.post<{ preset: PresetDto }>(`${this.base(studioId)}/import`, doc))).preset;
  }
  async links(studioId: string, id: string): Promise<ShareLinkDto[]> {
    return (await firstValueFrom(this.http.get<{ links: ShareLinkDto[] }>(`${this.base(studioId)}/${id}/links`))).links;
  }
  async createLink(studioId: string, id: string, body: { artworkId?: string; expiresInDays?: number }): Promise<ShareLinkDto> {
    return (await firstValueFrom(this.http.post<{ link: ShareLinkDto }>(`${this.base(studioId)}/${id}/links`, body))).link;
  }
  async revokeLink(studioId: string, id: string, linkId: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}/links/${linkId}`));
  }
  async shared(token: string): Promise<SharedViewDto> {
    return (await firstValueFrom(this.http.get<{ shared: SharedViewDto }>(`/api/share/${token}`))).shared;
  }
  /** The frames of a shared look's artwork, as the reference renderer sees them. */
  async sharedFrames(view: SharedViewDto): Promise<Frame[]> {
    return unpackFrames(await firstValueFrom(this.http.get(view.framesUrl!, { responseType: 'arraybuffer' })), view.artwork!);
  }
  async activity(studioId: string): Promise<ActivityDto[]> {
    return (await firstValueFrom(this.http.get<{ activity: ActivityDto[] }>(`/api/studios/${studioId}/activity`))).activity;
  }
  /** A reference render of a studio artwork with these parameters (for thumbnails and comparisons). */
  async render(studioId: string, artworkId: string, parameters: PanelParams, scale = 1): Promise<RenderDto> {
    return (
      await firstValueFrom(
        this.http.post<{ render: RenderDto }>(`/api/studios/${studioId}/renders`, { artworkId, parameters, scale, frame: 0 }),
      )
    ).render;
  }
}
