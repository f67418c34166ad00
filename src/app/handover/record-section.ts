import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { HandoverRecord, HandoverSection } from '../../../shared/handover/handover-api';
import { formatAzimuth, formatLocalDateTime } from '../readout/format-quantity';

/** The part of one checklist section the server filled in from its records (read-only). */
@Component({
  selector: 'tw-record-section',
  template: `
    @let r = record();
    @switch (section()) {
      @case ('apparatus') {
        @let a = r.apparatus;
        <dl class="facts">
          <dt>Field</dt>
          <dd>@if (a.field; as f) { {{ f.magnitudeG.toFixed(2) }} G, θ {{ f.thetaDeg === null ? '—' : f.thetaDeg.toFixed(1) + '°' }}, φ {{ azimuth(f.phiDeg, 1) }} } @else { no telemetry }</dd>
          <dt>Coil currents</dt>
          <dd>@if (a.currentsA; as c) { x {{ c.x.toFixed(2) }} A, y {{ c.y.toFixed(2) }} A, z {{ c.z.toFixed(2) }} A } @else { no telemetry }</dd>
          <dt>Software interlock</dt>
          <dd [class.abnormal]="a.interlock === 'tripped'">{{ a.interlock === 'tripped' ? 'Tripped — first out: ' + (a.interlockFirstOut ?? 'unknown') : 'Not tripped' }}</dd>
          <dt>Hardware interlock</dt>
          <dd [class.abnormal]="a.hardwareTripped">{{ a.hardwareTripped ? 'Tripped (' + (a.hardwareTripCause ?? 'cause not reported') + ')' : 'Not tripped' }}</dd>
          <dt>Controller</dt>
          <dd [class.abnormal]="!a.controllerOnline">{{ a.controllerOnline ? 'Online' : 'Offline' }}{{ a.controllerMode ? ', mode ' + a.controllerMode : '' }}</dd>
          <dt>Calibration</dt>
          <dd>{{ a.calibration ?? '—' }}</dd>
        </dl>
        <p class="stamp">As recorded at {{ local(r.filledAt) }}{{ a.telemetryAt ? '; newest telemetry ' + local(a.telemetryAt) : '' }}.</p>
      }
      @case ('alarms') {
        <ul>
          @for (al of r.alarms; track al.id) {
            <li><strong>{{ al.id }}</strong> — {{ al.state }}, {{ al.priority }} priority{{ al.shelf ? '; shelved by ' + al.shelf.by + ': ' + al.shelf.reason : '' }}</li>
          } @empty {
            <li class="none">Every alarm is normal.</li>
          }
        </ul>
      }
      @case ('trips') {
        <ul>
          @for (t of r.trips; track t.trippedAt) {
            <li>
              <strong>{{ local(t.trippedAt) }}</strong> — {{ t.firstOut }}
              @if (t.reset; as reset) {
                <br />Reset {{ local(reset.at) }} by {{ reset.by }}: “{{ reset.reason }}”
              } @else {
                <br /><span class="abnormal">Not reset</span>
              }
            </li>
          } @empty {
            <li class="none">No interlock trip in this shift.</li>
          }
        </ul>
      }
      @case ('changes') {
        <ul>
          @for (c of r.changes; track $index) {
            <li><strong>{{ local(c.at) }}</strong> — {{ c.action }} {{ c.subject }} by {{ c.actor }}{{ c.reason ? ': “' + c.reason + '”' : '' }}</li>
          } @empty {
            <li class="none">No calibration, profile or limit change.</li>
          }
        </ul>
      }
      @case ('runs') {
        @if (r.runs.recorded) {
          <ul>
            @for (run of r.runs.items; track run.id) {
              <li><strong>{{ local(run.at) }}</strong> — {{ run.label }}</li>
            } @empty {
              <li class="none">No run in this shift.</li>
            }
          </ul>
        } @else {
          <p class="none">{{ r.runs.note }}</p>
        }
      }
      @case ('logbook') {
        <ul>
          @for (e of r.logbook; track e.id) {
            <li><strong>{{ local(e.at) }}</strong> {{ e.author }}: {{ firstLine(e.text) }}{{ e.amends !== null ? ' (correction of #' + e.amends + ')' : '' }}</li>
          } @empty {
            <li class="none">No logbook entry written in this shift.</li>
          }
        </ul>
      }
    }
  `,
  styles: `
    .facts {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 2px 16px;
      margin: 0;
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
      font-variant-numeric: tabular-nums;
    }
    ul {
      margin: 0;
      padding-left: 20px;
    }
    li + li {
      margin-top: 4px;
    }
    .none,
    .stamp {
      color: var(--mat-sys-on-surface-variant);
      margin: 0;
    }
    li.none {
      list-style: none;
      margin-left: -20px;
    }
    .stamp {
      margin-top: 6px;
      font: var(--mat-sys-body-small);
    }
    .abnormal {
      color: var(--tw-trip-text);
      font-weight: 600;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RecordSection {
  readonly record = input.required<HandoverRecord>();
  readonly section = input.required<HandoverSection>();

  protected readonly azimuth = formatAzimuth;

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected firstLine(text: string): string {
    // The first line as plain words: Markdown marks left out.
    const line = (text.split('\n').find((l) => l.trim() !== '') ?? '').replace(/[*_`#>]+/g, '').trim();
    return line.length > 160 ? `${line.slice(0, 157)}…` : line;
  }
}
