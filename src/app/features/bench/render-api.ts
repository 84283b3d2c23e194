import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { RenderDto } from '@shared/api/render.schema';
import type { PanelParams } from '@shared/model/parameters';

/** Reference renders of studio artworks, made on the server (the drift check's and the download's source). */
@Injectable({ providedIn: 'root' })
export class RenderApi {
  private readonly http = inject(HttpClient);

  async render(studioId: string, body: { artworkId: string; parameters: PanelParams; scale: number; frame: number }): Promise<RenderDto> {
    return (await firstValueFrom(this.http.post<{ render: RenderDto }>(`/api/studios/${studioId}/renders`, body))).render;
  }

  png(render: RenderDto): Promise<Blob> {
    return firstValueFrom(this.http.get(render.url, { responseType: 'blob' }));
  }
}
