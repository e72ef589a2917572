import { importProvidersFrom } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { benchView } from '../../testing/fixtures';
import { HighVoltageBanner } from './high-voltage-banner';

describe('HighVoltageBanner', () => {
  async function render(benches: ReturnType<typeof benchView>[]) {
    TestBed.configureTestingModule({
      imports: [HighVoltageBanner],
      providers: [importProvidersFrom(MatIconTestingModule)],
    });
    const fixture = TestBed.createComponent(HighVoltageBanner);
    fixture.componentRef.setInput('benches', benches);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  it('stays hidden while no bench has high voltage on', async () => {
    const el = await render([benchView(), benchView({ id: 2, name: 'Bench B' })]);
    expect(el.querySelector('[role=alert]')).toBeNull();
  });

  it('names every bench whose outputs are live', async () => {
    const el = await render([
      benchView({}, 7),
      benchView({ id: 2, name: 'Bench B' }),
      benchView({ id: 3, name: 'Bench C', bridgeOnline: false }, 9),
    ]);
    const text = el.querySelector('[role=alert]')?.textContent?.replace(/\s+/g, ' ');
    expect(text).toContain('HIGH VOLTAGE LIVE — Bench A, Bench C (last report)');
    expect(text).not.toContain('Bench B');
  });
});
