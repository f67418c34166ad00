/**
 * Shapes of the shift-handover API (`/api/handovers`, `/api/handover-items`), shared by the
 * server and the web app. Plain TypeScript, safe in the browser.
 */
import type { AlarmListItem } from '../alarms/alarm-api.js';
import type { LogbookEntry } from '../logbook/logbook-api.js';

export type HandoverStatus = 'draft' | 'submitted' | 'accepted';

/** Sections of the checklist, in the order the screen and the mail show them. */
export const HANDOVER_SECTIONS = ['apparatus', 'alarms', 'trips', 'changes', 'runs', 'logbook', 'openItems'] as const;
export type HandoverSection = (typeof HANDOVER_SECTIONS)[number];

/** The outgoing person's remarks on each section. */
export type HandoverNotes = Partial<Record<HandoverSection, string>>;

export interface HandoverApparatus {
  /** Time of the newest telemetry (ISO 8601), null without any. */
  telemetryAt: string | null;
  controllerOnline: boolean;
  controllerMode: string | null;
  field: { magnitudeG: number; thetaDeg: number | null; phiDeg: number | null } | null;
  currentsA: { x: number; y: number; z: number } | null;
  setpointsA: { x: number; y: number; z: number } | null;
  interlock: 'ok' | 'tripped';
  /** Label of the first-out condition while tripped. */
  interlockFirstOut: string | null;
  hardwareTripped: boolean;
  hardwareTripCause: string | null;
  calibration: string | null;
}

export interface HandoverTrip {
  trippedAt: string;
  firstOut: string;
  reason: string;
  reset: { at: string; by: string; reason: string } | null;
}

/** A calibration, profile, limit or other setting change from the audit trail. */
export interface HandoverChange {
  at: string;
  actor: string;
  action: string;
  subject: string;
  reason: string | null;
}

/** What the server filled in from its records; read-only on the screen. */
export interface HandoverRecord {
  filledAt: string;
  apparatus: HandoverApparatus;
  /** Alarms not in the normal state: active, shelved, out of service, latched. */
  alarms: AlarmListItem[];
  trips: HandoverTrip[];
  changes: HandoverChange[];
  /** Runs and shots of the shift; `note` says why the list is empty when they are not recorded. */
  runs: { recorded: boolean; note: string | null; items: { id: string; label: string; at: string }[] };
  logbook: LogbookEntry[];
}

export interface HandoverItem {
  /** Null for an item added in a draft (it gets its number on submission). */
  id: number | null;
  text: string;
  openedBy: string;
  openedAt: string | null;
  /** True when carried in from an earlier handover. */
  carried: boolean;
  closed: { at: string; by: string; note: string } | null;
}

export interface Handover {
  id: number;
  status: HandoverStatus;
  author: string;
  createdAt: string;
  /** The shift this covers: since the previous accepted handover, until it was filled. */
  periodFrom: string;
  periodTo: string;
  record: HandoverRecord;
  summary: string;
  notes: HandoverNotes;
  openItems: HandoverItem[];
  submitted: { by: string; at: string } | null;
  accepted: { by: string; at: string; comment: string | null } | null;
}

export interface HandoverListItem {
  id: number;
  status: HandoverStatus;
  author: string;
  createdAt: string;
  periodFrom: string;
  periodTo: string;
  submitted: { by: string; at: string } | null;
  accepted: { by: string; at: string } | null;
}

export interface HandoverResponse {
  handover: Handover;
}

export interface HandoverListResponse {
  handovers: HandoverListItem[];
}

export const MAX_SUMMARY_CHARS = 10_000;
export const MAX_NOTE_CHARS = 4_000;
export const MAX_ITEM_CHARS = 500;
export const MAX_NEW_ITEMS = 30;
