import { HttpClient, HttpEventType, type HttpEvent } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { filter, firstValueFrom, map, type Observable } from 'rxjs';
import type { ArtworkDto } from '@shared/api/dto';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import { unpackFrames } from '@shared/pipeline/frames';
import type { Frame } from '@shared/pipeline/types';

/** Upload progress (0–1) until the server answers with the stored artwork. */
export type UploadEvent = { kind: 'progress'; share: number } | { kind: 'done'; artwork: ArtworkDto };

/** HTTP calls for a studio's artwork library. */
@Injectable({ providedIn: 'root' })
export class ArtworkApi {
  private readonly http = inject(HttpClient);

  async list(studioId: string, q = '', sort = 'newest'): Promise<ArtworkDto[]> {
    const params = { ...(q ? { q } : {}), sort };
    return (await firstValueFrom(this.http.get<{ artworks: ArtworkDto[] }>(`/api/studios/${studioId}/artworks`, { params }))).artworks;
  }

  /** Uploads one file (and a sprite-sheet grid if given), reporting progress. */
  upload(studioId: string, file: File, sheet?: SpriteSheet): Observable<UploadEvent> {
    const form = new FormData();
    if (sheet) {
      form.append('frameWidth', String(sheet.frameWidth));
      form.append('frameHeight', String(sheet.frameHeight));
      form.append('frameDelayMs', String(sheet.frameDelayMs));
    }
    form.append('file', file, file.name || 'pasted.png');
    return this.http
      .post<{ artwork: ArtworkDto }>(`/api/studios/${studioId}/artworks`, form, { reportProgress: true, observe: 'events' })
      .pipe(
        filter((e: HttpEvent<{ artwork: ArtworkDto }>) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
        map((e): UploadEvent =>
          e.type === HttpEventType.Response
            ? { kind: 'done', artwork: e.body!.artwork }
            : { kind: 'progress', share: e.type === HttpEventType.UploadProgress && e.total ? e.loaded / e.total : 0 },
        ),
      );
  }

  async rename(studioId: string, id: string, name: string): Promise<ArtworkDto> {
    return (await firstValueFrom(this.http.patch<{ artwork: ArtworkDto }>(`/api/studios/${studioId}/artworks/${id}`, { name }))).artwork;
  }

  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/studios/${studioId}/artworks/${id}`));
  }

  /** The live share links that show this artwork, by preset name. */
  async liveLinks(studioId: string, id: string): Promise<{ id: string; presetId: string; presetName: string; expiresAt: string | null }[]> {
    return (
      await firstValueFrom(
        this.http.get<{ links: { id: string; presetId: string; presetName: string; expiresAt: string | null }[] }>(
          `/api/studios/${studioId}/artworks/${id}/links`,
        ),
      )
    ).links;
  }

  async get(studioId: string, id: string): Promise<ArtworkDto> {
    return (await firstValueFrom(this.http.get<{ artwork: ArtworkDto }>(`/api/studios/${studioId}/artworks/${id}`))).artwork;
  }

  /** The decoded frames, exactly as the server's reference renderer sees them. */
  async frames(artwork: ArtworkDto): Promise<Frame[]> {
    return unpackFrames(await firstValueFrom(this.http.get(artwork.framesUrl, { responseType: 'arraybuffer' })), artwork);
  }
}
