import { HttpClient } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { SavedTimingDto } from '@shared/api/dto';
import type { CreateTimingBody } from '@shared/api/timing.schema';

/** HTTP calls for a studio's saved drive timings. */
@Injectable({ providedIn: 'root' })
export class TimingApi {
  private readonly http = inject(HttpClient);

  async list(studioId: string): Promise<SavedTimingDto[]> {
    return (await firstValueFrom(this.http.get<{ timings: SavedTimingDto[] }>(`/api/studios/${studioId}/timings`))).timings;
  }
  async create(studioId: string, body: CreateTimingBody): Promise<SavedTimingDto> {
    return (await firstValueFrom(this.http.post<{ timing: SavedTimingDto }>(`/api/studios/${studioId}/timings`, body))).timing;
  }
  async update(studioId: string, id: string, body: Partial<CreateTimingBody>): Promise<SavedTimingDto> {
    return (await firstValueFrom(this.http.patch<{ timing: SavedTimingDto }>(`/api/studios/${studioId}/timings/${id}`, body))).timing;
  }
  async remove(studioId: string, id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/studios/${studioId}/timings/${id}`));
  }
}
