import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { Component, signal } from '@angular/core';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatExpansionPanelHarness } from '@angular/material/expansion/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSliderHarness } from '@angular/material/slider/testing';
import { MatSlideToggleHarness } from '@angular/material/slide-toggle/testing';
import { TestBed } from '@angular/core/testing';
import { BUILT_IN_PRESETS } from '@shared/model/panel-types';
import type { PanelParams } from '@shared/model/parameters';
import { applyParamEdit, ParamControls, type ParamEdit } from './param-controls';

/** The bench's wiring, reduced to what the race needs: the parameters live here, edits apply to them. */
@Component({
  imports: [ParamControls],
  template: `<em-param-controls [params]="params()" [defaults]="defaults" (changed)="apply($event)" />`,
})
class Host {
  readonly defaults = BUILT_IN_PRESETS[0].parameters;
  readonly params = signal<PanelParams>(structuredClone(BUILT_IN_PRESETS[0].parameters));
  apply(edit: ParamEdit): void {
    this.params.update((p) => applyParamEdit(p, edit));
  }
}

describe('ParamControls (issue "Workflow", item 2)', () => {
  beforeEach(() => TestBed.configureTestingModule({ imports: [Host] }));

  const field = (el: HTMLElement, id: string) => el.querySelector<HTMLInputElement>(`#${id}`)!;
  const type = (input: HTMLInputElement, value: string) => {
    input.value = value;
    input.dispatchEvent(new Event('change'));
  };

  test('two fields typed before the page redraws both stick: no edit is undone by a stale copy', async () => {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    // Both changes land before any change detection, as on a busy machine: the second field's
    // component input still holds the parameters from before the first change.
    type(field(el, 'glass-glowRadiusMm'), '1.1');
    type(field(el, 'glass-glowShare'), '0.3');
    expect(fixture.componentInstance.params().glass.glowRadiusMm).toBe(1.1);
    expect(fixture.componentInstance.params().glass.glowShare).toBe(0.3);
    await fixture.whenStable();
    // The boxes show what is in force, and so would the render and a save.
    expect(field(el, 'glass-glowRadiusMm').value).toBe('1.1');
    expect(field(el, 'glass-glowShare').value).toBe('0.3');
  });

  test('a value outside the range is clamped to it, and a reset puts back the group only', async () => {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    type(field(el, 'glass-glowShare'), '5');
    type(field(el, 'drive-grayLevels'), '4');
    expect(fixture.componentInstance.params().glass.glowShare).toBe(0.9);
    await fixture.whenStable();
    const reset = [...el.querySelectorAll('button')].find((b) => b.textContent?.includes('Reset Glass'))!;
    reset.click();
    expect(fixture.componentInstance.params().glass).toEqual(BUILT_IN_PRESETS[0].parameters.glass);
    expect(fixture.componentInstance.params().drive.grayLevels).toBe(4);
  });

  test('a duty table is typed as a list: a bad one stays in the field with what to fix and changes nothing; a good one applies and sets the number of levels', async () => {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    const before = fixture.componentInstance.params().drive;
    fixture.componentInstance.params.update((p) => ({ ...p, drive: { ...p.drive, levelSpacing: 'table' } }));
    await fixture.whenStable();
    const table = field(el, 'drive-dutyTable');
    type(table, '0, 0.5, 0.3, 1');
    await fixture.whenStable();
    expect(el.querySelector('#drive-dutyTable-hint')!.textContent).toContain('value 3 (0.3) is not above value 2 (0.5)');
    expect(table.getAttribute('aria-invalid')).toBe('true');
    expect(fixture.componentInstance.params().drive.dutyTable).toEqual(before.dutyTable);
    type(table, 'half, 1');
    await fixture.whenStable();
    expect(el.querySelector('#drive-dutyTable-hint')!.textContent).toContain('“half” is not a number');
    type(table, '0 0.02 0.1 0.3 0.6 1');
    await fixture.whenStable();
    expect(fixture.componentInstance.params().drive.dutyTable).toEqual([0, 0.02, 0.1, 0.3, 0.6, 1]);
    expect(table.getAttribute('aria-invalid')).toBeNull();
    // Gray levels now follow the table, read-only, and say why.
    expect(field(el, 'drive-grayLevels').readOnly).toBe(true);
    expect(field(el, 'drive-grayLevels').value).toBe('6');
    expect(el.querySelector('#drive-grayLevels-lock')!.textContent).toContain('Set by the duty table');
  });
});

describe('ParamControls through Material harnesses (issue "Craft", item 8)', () => {
  let loader: HarnessLoader;
  let host: Host;
  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [Host] });
    const fixture = TestBed.createComponent(Host);
    loader = TestbedHarnessEnvironment.loader(fixture);
    host = fixture.componentInstance;
    await fixture.whenStable();
  });

  test('one panel a group, in the order of the light; the first, Glass and Drive open', async () => {
    const panels = await loader.getAllHarnesses(MatExpansionPanelHarness);
    const titles = await Promise.all(panels.map((p) => p.getTitle()));
    expect(titles).toEqual(['Source', 'Drive', 'Cell', 'Emission', 'Glass', 'Viewing']);
    const open = await Promise.all(panels.map((p) => p.isExpanded()));
    expect(titles.filter((_, k) => open[k])).toEqual(['Source', 'Drive', 'Glass']);
  });

  test('a choice is picked by its label and stored as its value', async () => {
    const dither = await loader.getHarness(MatSelectHarness.with({ selector: '#drive-dither' }));
    await dither.open();
    const labels = await Promise.all((await dither.getOptions()).map((o) => o.getText()));
    expect(labels).toContain('Error diffusion (Floyd–Steinberg)');
    await dither.clickOptions({ text: 'Error diffusion (Floyd–Steinberg)' });
    expect(host.params().drive.dither).toBe('floyd-steinberg');
    expect(await dither.getValueText()).toBe('Error diffusion (Floyd–Steinberg)');
  });

  test('a switch sets a yes/no parameter, and the group can then be reset', async () => {
    const reset = await loader.getHarness(MatButtonHarness.with({ text: /Reset Source/ }));
    expect(await reset.isDisabled()).toBe(true);
    const invert = await loader.getHarness(MatSlideToggleHarness.with({ label: 'Invert' }));
    await invert.toggle();
    expect(host.params().source.invert).toBe(!BUILT_IN_PRESETS[0].parameters.source.invert);
    expect(await reset.isDisabled()).toBe(false);
    await reset.click();
    expect(host.params().source).toEqual(BUILT_IN_PRESETS[0].parameters.source);
    expect(await invert.isChecked()).toBe(BUILT_IN_PRESETS[0].parameters.source.invert);
  });

  test('a slider moves its parameter within the range, and the number box beside it follows', async () => {
    const slider = await loader.getHarness(MatSliderHarness.with({ selector: ':has(input[aria-label="Glow share"])' }));
    expect(await slider.getMaxValue()).toBe(0.9);
    const thumb = await slider.getEndThumb();
    await thumb.setValue(0.45);
    expect(host.params().glass.glowShare).toBe(0.45);
    expect((document.querySelector('#glass-glowShare') as HTMLInputElement).value).toBe('0.45');
  });
});
