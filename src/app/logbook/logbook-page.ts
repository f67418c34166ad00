import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { hasRole } from '../../../shared/auth/roles';
import type { LogbookEntry } from '../../../shared/logbook/logbook-api';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { EntryComposer } from './entry-composer';
import { LogbookClient, type LogbookFilter } from './logbook-client';
import { LogbookEntryCard } from './logbook-entry';

/** Entries of one local calendar day on the timeline. */
interface Day {
  label: string;
  entries: LogbookEntry[];
}

/**
 * The Logbook: operators write (text, tags, time, link, files), everyone searches and filters,
 * entries appear as a timeline by day, newest first; corrections sit beside what they correct.
 */
@Component({
  selector: 'tw-logbook-page',
  imports: [EntryComposer, FormsModule, LogbookEntryCard, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './logbook-page.html',
  styleUrl: './logbook-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LogbookPage {
  private readonly client = inject(LogbookClient);
  private readonly session = inject(Session);

  protected readonly canWrite = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'operator');
  });
  protected readonly filter = signal<LogbookFilter>({ q: '', tag: '', from: '', to: '' });
  protected readonly entries = signal<LogbookEntry[] | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly amending = signal<LogbookEntry | null>(null);
  protected readonly filtered = computed(() => Object.values(this.filter()).some((v) => v.trim() !== ''));
  protected readonly days = computed<Day[]>(() => {
    const days: Day[] = [];
    for (const entry of this.entries() ?? []) {
      const label = new Date(entry.at).toLocaleDateString(undefined, { weekday: 'long', year: 'numeric', month: 'long', day: 'numeric' });
      if (days.at(-1)?.label !== label) days.push({ label, entries: [] });
      days.at(-1)!.entries.push(entry);
    }
    return days;
  });

  constructor() {
    void this.load();
  }

  protected setFilter(key: keyof LogbookFilter, value: string): void {
    this.filter.update((f) => ({ ...f, [key]: value }));
  }

  protected pickTag(tag: string): void {
    this.setFilter('tag', tag);
    void this.load();
  }

  protected clearFilter(): void {
    this.filter.set({ q: '', tag: '', from: '', to: '' });
    void this.load();
  }

  protected async load(): Promise<void> {
    const f = this.filter();
    const iso = (local: string) => (local ? new Date(local).toISOString() : '');
    try {
      this.entries.set(await this.client.list({ ...f, from: iso(f.from), to: iso(f.to) }));
      this.problem.set(null);
    } catch (error) {
      this.problem.set(errorText(error));
    }
  }

  protected startCorrection(entry: LogbookEntry): void {
    this.amending.set(entry);
    window.scrollTo({ top: 0, behavior: 'smooth' });
  }

  protected async written(): Promise<void> {
    this.amending.set(null);
    await this.load();
  }
}
