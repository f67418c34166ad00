import type { MqttClient } from 'mqtt';
import type { ControllerStatus } from '../shared/telemetry/messages.js';
import { TOPICS } from '../shared/telemetry/topics.js';
import type { FaultBook } from './faults.js';
import type { FramePeriod } from './simulation.js';

/**
 * Publishes telemetry (QoS 0, not retained) and the retained status. Telemetry produced while
 * the connection is down is dropped rather than queued: stale samples delivered late would
 * only mislead, and the sequence numbers show the gap. A `sensor-dropout` fault suppresses the
 * affected stream here, at the controller's output, while the status keeps saying online.
 */
export class TelemetryPublisher {
  published = { fast: 0, slow: 0, status: 0 };

  constructor(private readonly client: MqttClient, private readonly faults: FaultBook) {}

  publishFrames(period: FramePeriod): void {
    if (!this.client.connected) return;
    if (!this.faults.droppedOut('fast')) {
      this.client.publish(TOPICS.fast, JSON.stringify(period.fast), { qos: 0 });
      this.published.fast++;
    }
    if (!this.faults.droppedOut('slow')) {
      for (const frame of period.slow) {
        this.client.publish(TOPICS.slow, JSON.stringify(frame), { qos: 0 });
        this.published.slow++;
      }
    }
  }

  /** Publishes `status` retained at QoS 1; resolves once the broker has it (or at once when offline). */
  async publishStatus(status: ControllerStatus): Promise<void> {
    if (!this.client.connected) return;
    this.published.status++;
    await this.client.publishAsync(TOPICS.status, JSON.stringify(status), { qos: 1, retain: true });
  }
}
