import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { LogbookEntry } from '../../../shared/logbook/logbook-api';
import { formatLocalDateTime } from '../readout/format-quantity';
import { AttachmentView } from './attachment-view';
import { renderMarkdown } from './markdown';

/** One entry on the timeline: when, who, tags, link, the rendered note, files and corrections. */
@Component({
  selector: 'tw-logbook-entry',
  imports: [AttachmentView, MatButtonModule, MatIconModule],
  template: `
    @let e = entry();
    <article class="entry" [class.corrected]="e.amendedBy.length > 0" [attr.aria-label]="'Entry ' + e.id" [attr.id]="'entry-' + e.id">
      <header>
        <span class="when">{{ local(e.at) }}</span>
        <span class="who">{{ e.author }}</span>
        <span class="num">#{{ e.id }}</span>
        @if (e.at !== e.createdAt && Math.abs(Date.parse(e.createdAt) - Date.parse(e.at)) > 60000) {
          <span class="written">written {{ local(e.createdAt) }}</span>
        }
      </header>
      @if (e.amends !== null) {
        <p class="amend-note"><mat-icon aria-hidden="true" inline>edit_note</mat-icon> Correction of <a [href]="'#entry-' + e.amends">entry #{{ e.amends }}</a></p>
      }
      @if (e.amendedBy.length > 0) {
        <p class="amend-note corrected-note" role="note">
          <mat-icon aria-hidden="true" inline>report</mat-icon> Corrected later by
          @for (id of e.amendedBy; track id) {
            <a [href]="'#entry-' + id">entry #{{ id }}</a>{{ $last ? '' : ', ' }}
          }
          — read that too
        </p>
      }
      <div class="text" [innerHTML]="html()"></div>
      @if (e.tags.length > 0 || e.link) {
        <p class="meta">
          @for (tag of e.tags; track tag) {
            <button type="button" class="tag" (click)="tagPicked.emit(tag)" [attr.aria-label]="'Show entries tagged ' + tag">#{{ tag }}</button>
          }
          @if (e.link; as link) {
            <span class="link"><mat-icon aria-hidden="true" inline>link</mat-icon> {{ linkLabel() }}</span>
          }
        </p>
      }
      @if (e.attachments.length > 0) {
        <div class="files">
          @for (a of e.attachments; track a.id) {
            <tw-attachment-view [attachment]="a" />
          }
        </div>
      }
      @if (canWrite()) {
        <div class="actions">
          <button mat-button type="button" (click)="correct.emit(e)"><mat-icon aria-hidden="true">edit_note</mat-icon> Write a correction</button>
        </div>
      }
    </article>
  `,
  styleUrl: './logbook-entry.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LogbookEntryCard {
  readonly entry = input.required<LogbookEntry>();
  readonly canWrite = input(false);
  readonly correct = output<LogbookEntry>();
  readonly tagPicked = output<string>();

  protected readonly Math = Math;
  protected readonly Date = Date;
  protected readonly html = computed(() => renderMarkdown(this.entry().text));
  protected readonly linkLabel = computed(() => {
    const link = this.entry().link;
    if (!link) return '';
    if (link.kind === 'trip') return `Interlock trip at ${formatLocalDateTime(Date.parse(link.ref))}`;
    if (link.kind === 'alarm') return `Alarm ${link.ref}`;
    if (link.kind === 'run') return `Run ${link.ref}`;
    return `Shot ${link.ref}`;
  });

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }
}
