import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import type { SavedTimingDto } from '@shared/api/dto';
import type { CreateTimingBody } from '@shared/api/timing.schema';
import { evaluateTiming } from '@shared/drive/evaluate';
import type { Role } from '@shared/model/roles';
import { ArtworkApi } from '../artworks/artwork-api';
import { PresetApi } from '../presets/preset-api';
import { StudioContext } from '../studio/studio-context';
import { DriveTiming } from './drive-timing';
import { TimingApi } from './timing-api';

const STUDIO = '5f0c3c1e-0000-4000-8000-000000000002';

/** The saved timings, in memory, made the way the server makes them (the shared evaluation). */
class FakeTimingApi {
  readonly saved: SavedTimingDto[] = [];
  readonly sent: CreateTimingBody[] = [];
  async list() {
    return [...this.saved];
  }
  async create(_studioId: string, body: CreateTimingBody) {
    this.sent.push(body);
    const dto: SavedTimingDto = {
      id: `t${this.saved.length + 1}`,
      ...body,
      ...evaluateTiming(body),
      updatedAt: '2026-12-01T00:00:00.000Z',
    };
    this.saved.push(dto);
    return dto;
  }
}

describe('DriveTiming form (Material harnesses)', () => {
  let api: FakeTimingApi;
  let fixture: ComponentFixture<DriveTiming>;
  let loader: HarnessLoader;
  let el: HTMLElement;

  async function open(role: Role): Promise<void> {
    api = new FakeTimingApi();
    TestBed.configureTestingModule({
      imports: [DriveTiming],
      providers: [
        provideRouter([]),
        StudioContext,
        { provide: TimingApi, useValue: api },
        { provide: ArtworkApi, useValue: { list: async () => [] } },
        { provide: PresetApi, useValue: { list: async () => ({ presets: [], total: 0 }) } },
      ],
    });
    TestBed.inject(StudioContext).studio.set({ id: STUDIO, name: 'Kiln', role, createdAt: '2026-11-01T00:00:00.000Z' });
    fixture = TestBed.createComponent(DriveTiming);
    loader = TestbedHarnessEnvironment.loader(fixture);
    el = fixture.nativeElement;
    await fixture.whenStable();
  }

  /** A figure of "What it gives" by its term. */
  const figure = (term: string) =>
    [...el.querySelectorAll('.results dl.figures > div')].find((d) => d.querySelector('dt')?.textContent === term)?.querySelector('dd')
      ?.textContent;
  /** The text box of the form field with this label. */
  const input = async (label: string) =>
    (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }))).getControl(MatInputHarness);

  test('opens on DMT 640×480 at 60 Hz: 25.175 MHz, 31.469 kHz line rate, 59.940 Hz refresh [std: VESA DMT 1.0 r13]', async () => {
    await open('viewer');
    expect(figure('Pixel clock')).toBe('25.175 MHz');
    expect(figure('Line rate')).toBe('31.469 kHz');
    expect(figure('Refresh')).toBe('59.940 Hz');
    // A viewer reads; only editors name and save.
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Save timing/ }))).toHaveLength(0);
  });

  test('a timing typed by hand updates the figures as it is typed, and one that cannot work says why', async () => {
    await open('editor');
    await (await loader.getHarness(MatButtonToggleHarness.with({ text: 'By hand' }))).check();
    const clock = await input('Pixel clock (MHz)');
    await clock!.setValue('50.35');
    await fixture.whenStable();
    // Twice the clock over the same 800 × 525 totals: twice the line rate and the refresh.
    expect(figure('Line rate')).toBe('62.938 kHz');
    expect(figure('Refresh')).toBe('119.881 Hz');
    await clock!.setValue('0');
    await fixture.whenStable();
    expect(el.querySelector('.results [role=alert]')?.textContent).toContain('This timing cannot be used');
  });

  test('a CVT mode typed loosely is saved in the stored form, with the name given; no name, no save', async () => {
    await open('editor');
    const standard = await loader.getHarness(MatSelectHarness.with({ selector: '[formcontrolname=standard]' }));
    await standard.open();
    await standard.clickOptions({ text: 'CVT 1.2' });
    await (await input('Mode (width x height @ Hz)'))!.setValue('800 x 600 @ 75');
    const save = await loader.getHarness(MatButtonHarness.with({ text: /Save timing/ }));
    await save.click();
    await fixture.whenStable();
    expect(api.sent).toEqual([]);
    const name = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Name' }));
    expect(await name.getTextErrors()).toEqual(['Give the timing a name.']);
    await (await name.getControl(MatInputHarness))!.setValue('Handheld 800');
    await save.click();
    await fixture.whenStable();
    expect(api.sent).toHaveLength(1);
    expect(api.sent[0]).toMatchObject({ name: 'Handheld 800', source: { kind: 'standard', standard: 'cvt', mode: '800x600@75' } });
    // Saved, it shows in the studio's list and the button now saves changes to it.
    expect(await (await loader.getHarness(MatButtonHarness.with({ selector: '.saved button' }))).getText()).toContain('Handheld 800');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Save changes/ }))).toHaveLength(1);
  });
});
