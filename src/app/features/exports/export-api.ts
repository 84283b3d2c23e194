import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AnimationRequest, ExportDto, ExportLinkDto, SharedExportDto, SheetRequest } from '@shared/api/export.schema';

/** HTTP calls for a studio's exports (comparison sheets made in the background). */
@Injectable({ providedIn: 'root' })
export class ExportApi {
  private readonly http = inject(HttpClient);
  private readonly base = (studioId: string) => `/api/studios/${studioId}/exports`;

  async list(studioId: string): Promise<ExportDto[]> {
    return (await firstValueFrom(this.http.get<{ exports: ExportDto[] }>(this.base(studioId)))).exports;
  }
  async create(studioId: string, body: Partial<SheetRequest>): Promise<ExportDto> {
    return (await firstValueFrom(this.http.post<{ export: ExportDto }>(this.base(studioId), body))).export;
  }
  async createAnimation(studioId: string, body: Partial<AnimationRequest>): Promise<ExportDto> {
    return (await firstValueFrom(this.http.post<{ export: ExportDto }>(`${this.base(studioId)}/animations`, body))).export;
  }
  async cancel(studioId: string, id: string): Promise<ExportDto> {
    return (await firstValueFrom(this.http.post<{ export: ExportDto }>(`${this.base(studioId)}/${id}/cancel`, {}))).export;
  }
  async retry(studioId: string, id: string): Promise<ExportDto> {
    return (await firstValueFrom(this.http.post<{ export: ExportDto }>(`${this.base(studioId)}/${id}/retry`, {}))).export;
  }
  async links(studioId: string, id: string): Promise<ExportLinkDto[]> {
    return (await firstValueFrom(this.http.get<{ links: ExportLinkDto[] }>(`${this.base(studioId)}/${id}/links`))).links;
  }
  async createLink(studioId: string, id: string, expiresInDays: number | null): Promise<ExportLinkDto> {
    return (
      await firstValueFrom(
        this.http.post<{ link: ExportLinkDto }>(`${this.base(studioId)}/${id}/links`, expiresInDays ? { expiresInDays } : {}),
      )
    ).link;
  }
  async revokeLink(studioId: string, id: string, linkId: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}/links/${linkId}`));
  }
  /** What an export's share link opens (no session needed). */
  async shared(token: string): Promise<SharedExportDto> {
    return (await firstValueFrom(this.http.get<{ export: SharedExportDto }>(`/api/shared-exports/${token}`))).export;
  }
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}`));
  }
}
