import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { hasRole } from '../../../shared/auth/roles';
import type { Handover, HandoverListItem } from '../../../shared/handover/handover-api';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { formatLocalDateTime } from '../readout/format-quantity';
import { HandoverClient } from './handover-client';
import { HandoverSheet } from './handover-sheet';

/**
 * Shift handover: the open handover (or a button to start one), and the history of earlier
 * ones with who handed over to whom. Opening a row shows that handover read-only.
 */
@Component({
  selector: 'tw-handover-page',
  imports: [HandoverSheet, MatButtonModule, MatIconModule],
  templateUrl: './handover-page.html',
  styleUrl: './handover-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HandoverPage {
  private readonly client = inject(HandoverClient);
  private readonly session = inject(Session);

  protected readonly list = signal<HandoverListItem[] | null>(null);
  protected readonly shown = signal<Handover | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly me = computed(() => {
    const user = this.session.user();
    return user ? { email: user.email, role: user.role } : null;
  });
  protected readonly open = computed(() => this.list()?.find((h) => h.status !== 'accepted') ?? null);
  protected readonly canStart = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'operator') && this.list() !== null && this.open() === null;
  });

  constructor() {
    void this.refresh(true);
  }

  protected local(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected statusText(status: HandoverListItem['status']): string {
    return status === 'draft' ? 'Draft' : status === 'submitted' ? 'Waiting for acceptance' : 'Accepted';
  }

  protected async start(): Promise<void> {
    await this.act(async () => this.shown.set(await this.client.start()));
  }

  protected async show(id: number): Promise<void> {
    await this.act(async () => this.shown.set(await this.client.get(id)));
  }

  protected async changed(handover: Handover): Promise<void> {
    this.shown.set(handover);
    await this.refresh(false);
  }

  /** Reads the list; on first load shows the open handover, if any. */
  private async refresh(showOpen: boolean): Promise<void> {
    await this.act(async () => {
      this.list.set(await this.client.list());
      const open = this.open();
      if (showOpen && open) this.shown.set(await this.client.get(open.id));
    });
  }

  private async act(step: () => Promise<void>): Promise<void> {
    this.busy.set(true);
    try {
      await step();
      this.problem.set(null);
    } catch (error) {
      this.problem.set(errorText(error));
    } finally {
      this.busy.set(false);
    }
  }
}
