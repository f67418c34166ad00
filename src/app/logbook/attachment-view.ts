import { ChangeDetectionStrategy, Component, DestroyRef, inject, input, signal, effect } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { LogbookAttachment } from '../../../shared/logbook/logbook-api';
import { LogbookClient } from './logbook-client';

/**
 * One attachment of an entry: an image is fetched (signed in) and shown as a thumbnail that
 * opens full size; a PDF or CSV is offered as a download. Object URLs are released on destroy.
 */
@Component({
  selector: 'tw-attachment-view',
  imports: [MatButtonModule, MatIconModule],
  template: `
    @let a = attachment();
    @if (isImage() && imageUrl(); as url) {
      <a class="thumb" [href]="url" target="_blank" rel="noopener" [attr.aria-label]="'Open ' + a.fileName">
        <img [src]="url" [alt]="a.fileName" />
      </a>
    } @else {
      <button mat-stroked-button type="button" (click)="download()">
        <mat-icon aria-hidden="true">{{ isImage() ? 'image' : a.contentType === 'application/pdf' ? 'picture_as_pdf' : 'table_view' }}</mat-icon>
        {{ a.fileName }} <span class="size">({{ sizeText() }})</span>
      </button>
    }
  `,
  styles: `
    :host {
      display: inline-block;
    }
    .thumb img {
      display: block;
      max-width: 220px;
      max-height: 160px;
      border-radius: 6px;
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .size {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AttachmentView {
  readonly attachment = input.required<LogbookAttachment>();
  private readonly client = inject(LogbookClient);
  protected readonly imageUrl = signal<string | null>(null);
  private objectUrls: string[] = [];

  constructor() {
    inject(DestroyRef).onDestroy(() => this.objectUrls.forEach((u) => URL.revokeObjectURL(u)));
    effect(() => {
      const a = this.attachment();
      if (!a.contentType.startsWith('image/')) return;
      this.client.file(a.url).then(
        (blob) => this.imageUrl.set(this.keep(URL.createObjectURL(blob))),
        () => this.imageUrl.set(null),
      );
    });
  }

  protected isImage(): boolean {
    return this.attachment().contentType.startsWith('image/');
  }

  protected sizeText(): string {
    const bytes = this.attachment().sizeBytes;
    return bytes >= 1024 * 1024 ? `${(bytes / (1024 * 1024)).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1024))} kB`;
  }

  protected async download(): Promise<void> {
    const a = this.attachment();
    const url = this.keep(URL.createObjectURL(await this.client.file(a.url)));
    const link = document.createElement('a');
    link.href = url;
    link.download = a.fileName;
    link.click();
  }

  private keep(url: string): string {
    this.objectUrls.push(url);
    return url;
  }
}
