import { computed, Injectable, signal } from '@angular/core';
import type { StudioDto } from '@shared/api/dto';
import { roleAtLeast } from '@shared/model/roles';

/** The studio open in the shell, shared with its pages; provided by StudioShell. */
@Injectable()
export class StudioContext {
  readonly studio = signal<StudioDto | null>(null);
  readonly studioId = computed(() => this.studio()?.id ?? '');
  readonly role = computed(() => this.studio()?.role ?? null);
  /** Editors and owners change artworks, presets and timings. */
  readonly canEdit = computed(() => roleAtLeast(this.role(), 'editor'));
  /** Owners manage people. */
  readonly canManage = computed(() => roleAtLeast(this.role(), 'owner'));
}
