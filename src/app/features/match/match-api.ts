import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { MatchDto } from '@shared/api/match.schema';

/** HTTP calls for a studio's panel matches (a panel type fitted to a photo of the real panel). */
@Injectable({ providedIn: 'root' })
export class MatchApi {
  private readonly http = inject(HttpClient);
  readonly base = (studioId: string) => `/api/studios/${studioId}/matches`;

  /** Where the pattern PNG of a look downloads from. */
  patternUrl(studioId: string, look: string, format = 'png'): string {
    return `${this.base(studioId)}/pattern?look=${encodeURIComponent(look)}&format=${format}`;
  }
  async list(studioId: string): Promise<MatchDto[]> {
    return (await firstValueFrom(this.http.get<{ matches: MatchDto[] }>(this.base(studioId)))).matches;
  }
  async get(studioId: string, id: string): Promise<MatchDto> {
    return (await firstValueFrom(this.http.get<{ match: MatchDto }>(`${this.base(studioId)}/${id}`))).match;
  }
  async upload(
    studioId: string,
    file: File,
    fields: { look: string; activeWidthMm: number; activeHeightMm: number; cameraGamma: number | null },
  ): Promise<MatchDto> {
    const form = new FormData();
    form.append('file', file, file.name);
    form.append('look', fields.look);
    form.append('activeWidthMm', String(fields.activeWidthMm));
    form.append('activeHeightMm', String(fields.activeHeightMm));
    if (fields.cameraGamma) form.append('cameraGamma', String(fields.cameraGamma));
    return (await firstValueFrom(this.http.post<{ match: MatchDto }>(this.base(studioId), form))).match;
  }
  async setMarks(studioId: string, id: string, marks: [number, number][]): Promise<MatchDto> {
    return (await firstValueFrom(this.http.put<{ match: MatchDto }>(`${this.base(studioId)}/${id}/marks`, { marks }))).match;
  }
  async fit(studioId: string, id: string): Promise<MatchDto> {
    return (await firstValueFrom(this.http.post<{ match: MatchDto }>(`${this.base(studioId)}/${id}/fit`, {}))).match;
  }
  /** Saves a fit as a new preset (a name), or as a new revision of the studio preset it started from (null). */
  /** Saves a fit as a new preset (a name) or the next revision of its look (null); levelCurve takes the measured level curve as the duty table. */
  async save(studioId: string, id: string, name: string | null, levelCurve: boolean): Promise<{ presetId: string; match: MatchDto }> {
    return firstValueFrom(
      this.http.post<{ presetId: string; match: MatchDto }>(
        `${this.base(studioId)}/${id}/save`,
        name === null ? { revisionOfLook: true, levelCurve } : { name, levelCurve },
      ),
    );
  }
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}`));
  }
}
