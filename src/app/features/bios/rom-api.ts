import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { RomPatchRecord, VideoRomDetailDto, VideoRomDto } from '@shared/api/dto';
import type { RomPatchBody } from '@shared/api/rom.schema';

/** HTTP calls for a studio's video option ROM images. */
@Injectable({ providedIn: 'root' })
export class RomApi {
  private readonly http = inject(HttpClient);
  private readonly base = (studioId: string) => `/api/studios/${studioId}/roms`;

  async list(studioId: string): Promise<VideoRomDto[]> {
    return (await firstValueFrom(this.http.get<{ roms: VideoRomDto[] }>(this.base(studioId)))).roms;
  }
  async upload(studioId: string, file: File): Promise<VideoRomDto> {
    const form = new FormData();
    form.append('file', file, file.name || 'card.rom');
    return (await firstValueFrom(this.http.post<{ rom: VideoRomDto }>(this.base(studioId), form))).rom;
  }
  detail(studioId: string, id: string, tableOffset?: number): Promise<VideoRomDetailDto> {
    const params: Record<string, string> = tableOffset === undefined ? {} : { tableOffset: String(tableOffset) };
    return firstValueFrom(this.http.get<VideoRomDetailDto>(`${this.base(studioId)}/${id}`, { params }));
  }
  async image(rom: VideoRomDto): Promise<Uint8Array> {
    return new Uint8Array(await firstValueFrom(this.http.get(rom.imageUrl, { responseType: 'arraybuffer' })));
  }
  patch(studioId: string, id: string, body: RomPatchBody): Promise<{ rom: VideoRomDto; patch: RomPatchRecord }> {
    return firstValueFrom(this.http.post<{ rom: VideoRomDto; patch: RomPatchRecord }>(`${this.base(studioId)}/${id}/patch`, body));
  }
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`${this.base(studioId)}/${id}`));
  }
}
