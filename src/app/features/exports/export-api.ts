import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AnimationRequest, ExportDto, SheetRequest } from '../../../../shared/api/export.schema';

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
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}`));
  }
}
