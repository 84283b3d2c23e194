import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter, Router } from '@angular/router';
import type { PresetDto } from '@shared/api/dto';
import { BUILT_IN_PRESETS } from '@shared/model/panel-types';
import type { Role } from '@shared/model/roles';
import { ArtworkApi } from '../artworks/artwork-api';
import { StudioContext } from '../studio/studio-context';
import { PresetApi } from './preset-api';
import { PresetList } from './preset-list';

const STUDIO = '5f0c3c1e-0000-4000-8000-000000000001';
const preset = (n: number, panelTypeId = 'el-amber-640x480'): PresetDto => ({
  id: `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`,
  studioId: STUDIO,
  panelTypeId,
  name: `Look ${n}`,
  parameters: BUILT_IN_PRESETS[0].parameters,
  revision: n,
  isReference: n === 1,
  updatedAt: '2026-11-30T12:00:00.000Z',
  updatedBy: 'Ada',
});

/** The list's server, in memory: answers each page as the API does and remembers what it was asked. */
class FakePresetApi {
  readonly all = Array.from({ length: 12 }, (_, i) => preset(i + 1, i % 3 === 2 ? 'plasma-neon-640x400' : 'el-amber-640x480'));
  readonly asked: Record<string, unknown>[] = [];
  readonly created: { name: string; panelTypeId: string }[] = [];
  async list(_studioId: string, q: { panelTypeId?: string; q?: string; sort?: string; page?: number; pageSize?: number }) {
    this.asked.push(q);
    const hits = this.all.filter((p) => (!q.panelTypeId || p.panelTypeId === q.panelTypeId) && (!q.q || p.name.includes(q.q)));
    const size = q.pageSize ?? 25;
    return { presets: hits.slice((q.page ?? 0) * size, ((q.page ?? 0) + 1) * size), total: hits.length };
  }
  async create(_studioId: string, body: { name: string; panelTypeId: string }) {
    this.created.push(body);
    return { ...preset(99, body.panelTypeId), name: body.name };
  }
  get last() {
    return this.asked[this.asked.length - 1];
  }
}

describe('PresetList (Material harnesses)', () => {
  let api: FakePresetApi;
  let fixture: ComponentFixture<PresetList>;
  let loader: HarnessLoader;

  async function open(role: Role): Promise<void> {
    api = new FakePresetApi();
    TestBed.configureTestingModule({
      imports: [PresetList],
      providers: [
        provideRouter([]),
        StudioContext,
        { provide: PresetApi, useValue: api },
        { provide: ArtworkApi, useValue: { list: async () => [] } },
      ],
    });
    TestBed.inject(StudioContext).studio.set({ id: STUDIO, name: 'Kiln', role, createdAt: '2026-11-01T00:00:00.000Z' });
    fixture = TestBed.createComponent(PresetList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  }

  const names = async () => (await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName()).name.text;

  test('shows the first page, newest first, and the paginator turns to the next', async () => {
    await open('viewer');
    expect(api.last).toMatchObject({ sort: '-updated', page: 0, pageSize: 10 });
    const table = await loader.getHarness(MatTableHarness);
    expect(await table.getRows()).toHaveLength(10);
    const byColumn = await table.getCellTextByColumnName();
    expect(byColumn.name.text[0]).toContain('Look 1');
    expect(byColumn.name.text[0]).toContain('reference');
    expect(byColumn.panelType.text[2]).toBe('Gas plasma, neon orange 640 × 400');
    const paginator = await loader.getHarness(MatPaginatorHarness);
    expect(await paginator.getRangeLabel()).toBe('1 – 10 of 12');
    await paginator.goToNextPage();
    expect(api.last).toMatchObject({ page: 1, pageSize: 10 });
    expect(await names()).toEqual(['Look 11', 'Look 12']);
  });

  test('sorting by name asks the server for name order, then reversed', async () => {
    await open('viewer');
    const header = await (await loader.getHarness(MatSortHarness)).getSortHeaders({ label: 'Name' });
    await header[0].click();
    expect(api.last).toMatchObject({ sort: 'name', page: 0 });
    await header[0].click();
    expect(api.last).toMatchObject({ sort: '-name' });
  });

  test('the panel type filter and the search narrow the list and go back to the first page; no hit says so', async () => {
    await open('viewer');
    await (await loader.getHarness(MatPaginatorHarness)).goToNextPage();
    const filter = await loader.getHarness(MatSelectHarness.with({ selector: '.tools mat-select' }));
    await filter.open();
    await filter.clickOptions({ text: 'Gas plasma, neon orange 640 × 400' });
    expect(api.last).toMatchObject({ panelTypeId: 'plasma-neon-640x400', page: 0 });
    expect(await names()).toEqual(['Look 3', 'Look 6', 'Look 9', 'Look 12']);
    const search = await loader.getHarness(MatInputHarness.with({ selector: '.tools input' }));
    await search.setValue('nothing like it');
    await fixture.whenStable();
    expect(api.last).toMatchObject({ q: 'nothing like it' });
    expect(fixture.nativeElement.querySelector('td.empty').textContent).toContain('No preset matches.');
  });

  test('an editor creates a preset by name and panel type and lands on it; the button waits for a name', async () => {
    await open('editor');
    const create = await loader.getHarness(MatButtonHarness.with({ text: /Create preset/ }));
    expect(await create.isDisabled()).toBe(true);
    await (await loader.getHarness(MatInputHarness.with({ selector: '.create input' }))).setValue('  Night shift  ');
    const type = await loader.getHarness(MatSelectHarness.with({ selector: '.create mat-select' }));
    await type.open();
    await type.clickOptions({ text: 'Monochrome CRT, green (P1-like)' });
    expect(await create.isDisabled()).toBe(false);
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    await create.click();
    await fixture.whenStable();
    expect(api.created).toEqual([{ name: 'Night shift', panelTypeId: 'crt-green-p1' }]);
    expect(navigate).toHaveBeenCalledWith(['/studios', STUDIO, 'presets', preset(99).id]);
  });

  test('a viewer sees no create form and no import button', async () => {
    await open('viewer');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Create preset|Import/ }))).toHaveLength(0);
  });
});
