import { BreakpointObserver } from '@angular/cdk/layout';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { toSignal } from '@angular/core/rxjs-interop';
import { Router, RouterLink } from '@angular/router';
import { map } from 'rxjs';
import { PANEL_TYPES, panelTypeById } from '@shared/model/panel-types';
import { apiErrorCode, apiErrorMessage } from '../../core/api-error';
import { ArtworkApi } from '../artworks/artwork-api';
import { StudioContext } from '../studio/studio-context';
import { PresetApi } from './preset-api';
import { PresetThumb } from './preset-thumb';

/** The studio's presets: server-side sort, filter, search and pages; create and import. */
@Component({
  selector: 'em-preset-list',
  imports: [
    FormsModule,
    RouterLink,
    DatePipe,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    PresetThumb,
  ],
  templateUrl: './preset-list.html',
  styleUrl: './preset-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetList {
  private readonly api = inject(PresetApi);
  private readonly artworksApi = inject(ArtworkApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  protected readonly context = inject(StudioContext);

  protected readonly panelTypes = PANEL_TYPES;
  protected readonly typeName = (id: string) => panelTypeById(id)?.name ?? id;
  /** On a phone the panel type and revision go under the name, so the Changed column fits. */
  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe('(max-width: 600px)')
      .pipe(map((s) => s.matches)),
    { initialValue: false },
  );
  protected readonly columns = computed(() =>
    this.narrow() ? ['thumb', 'name', 'updated'] : ['thumb', 'name', 'panelType', 'revision', 'updated'],
  );
  protected readonly panelTypeId = signal('');
  protected readonly search = signal('');
  protected readonly sort = signal('-updated');
  protected readonly page = signal(0);
  protected readonly pageSize = signal(10);
  protected readonly newName = signal('');
  protected readonly newType = signal(PANEL_TYPES[0].id);
  protected readonly importErrors = signal<{ path: string; label: string; message: string }[]>([]);
  protected readonly presets = resource({
    params: () => ({
      studioId: this.context.studioId(),
      panelTypeId: this.panelTypeId(),
      q: this.search().trim(),
      sort: this.sort(),
      page: this.page(),
      pageSize: this.pageSize(),
    }),
    loader: ({ params }) => this.api.list(params.studioId, params),
  });
  private readonly artworks = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.artworksApi.list(params) });
  /** The artwork thumbnails are rendered with: the studio's newest. */
  protected readonly thumbArtwork = computed(() => (this.artworks.hasValue() ? this.artworks.value()[0]?.id : undefined));

  protected sortBy(s: Sort): void {
    const key = s.active === 'name' ? 'name' : 'updated';
    this.sort.set(s.direction === 'desc' ? `-${key}` : s.direction === 'asc' ? key : '-updated');
    this.page.set(0);
  }

  protected turnPage(e: PageEvent): void {
    this.page.set(e.pageIndex);
    this.pageSize.set(e.pageSize);
  }

  protected async createPreset(): Promise<void> {
    if (!this.newName().trim()) return;
    try {
      const p = await this.api.create(this.context.studioId(), { name: this.newName().trim(), panelTypeId: this.newType() });
      await this.router.navigate(['/studios', this.context.studioId(), 'presets', p.id]);
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  protected async importFile(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.importErrors.set([]);
    let doc: unknown;
    try {
      doc = JSON.parse(await file.text());
    } catch {
      this.importErrors.set([{ path: '$', label: 'The document', message: `${file.name} is not JSON.` }]);
      return;
    }
    try {
      const p = await this.api.importDocument(this.context.studioId(), doc);
      this.snackBar.open(`Imported “${p.name}”.`, undefined, { duration: 3000 });
      this.presets.reload();
    } catch (err) {
      const issues = (err as { error?: { error?: { details?: { issues?: { path: string; label: string; message: string }[] } } } }).error
        ?.error?.details?.issues;
      if (apiErrorCode(err) === 'invalid_document' && issues) this.importErrors.set(issues);
      else this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }
}
