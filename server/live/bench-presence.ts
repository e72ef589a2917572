import type { DeviceCapabilities } from '../../shared/domain/sweep';
import type { BenchDeviceStatus, HubToBridge } from '../../shared/hub/messages';
import type { DeviceExtensions } from '../../shared/protocol/check-plan';

/** What the hub needs of one bridge connection. */
export interface BridgeLink {
  /** Sends a message; false if the socket is no longer open. */
  send(message: HubToBridge): boolean;
  /** Closes the connection with a WebSocket close code. */
  close(code: number, reason: string): void;
}

interface Presence {
  link: BridgeLink;
  capabilities: DeviceCapabilities | null;
  extensions: DeviceExtensions | null;
}

/**
 * In-memory state of connected bridges, one per bench. The latest device status outlives the
 * connection so the app can still show what a bench last reported.
 */
export class BenchPresence {
  private readonly online = new Map<number, Presence>();
  private readonly lastStatus = new Map<number, BenchDeviceStatus>();

  /** Registers a connection for a bench; returns the one it replaces, if any. */
  connect(benchId: number, link: BridgeLink): BridgeLink | undefined {
    const previous = this.online.get(benchId);
    this.online.set(benchId, { link, capabilities: null, extensions: null });
    return previous?.link;
  }

  /** Forgets a connection; false if a newer one had already replaced it. */
  disconnect(benchId: number, link: BridgeLink): boolean {
    if (this.online.get(benchId)?.link !== link) return false;
    this.online.delete(benchId);
    return true;
  }

  /** Whether `link` is the bench's current connection. */
  isCurrent(benchId: number, link: BridgeLink): boolean {
    return this.online.get(benchId)?.link === link;
  }

  /** Whether the bench's bridge is connected. */
  isOnline(benchId: number): boolean {
    return this.online.has(benchId);
  }

  /** Capabilities announced on the current connection, or null. */
  capabilities(benchId: number): DeviceCapabilities | null {
    return this.online.get(benchId)?.capabilities ?? null;
  }

  /** Optional tracer functions announced on the current connection (quick tests), or null. */
  extensions(benchId: number): DeviceExtensions | null {
    return this.online.get(benchId)?.extensions ?? null;
  }

  /** Records the optional functions a bridge announced in `hello`. */
  setExtensions(benchId: number, extensions: DeviceExtensions | null): void {
    const p = this.online.get(benchId);
    if (p) p.extensions = extensions;
  }

  /** Latest status the bench reported (kept after it disconnects), or null. */
  status(benchId: number): BenchDeviceStatus | null {
    return this.lastStatus.get(benchId) ?? null;
  }

  /** Records what a bridge said in `hello`. */
  setCapabilities(benchId: number, capabilities: DeviceCapabilities | null): void {
    const p = this.online.get(benchId);
    if (p) p.capabilities = capabilities;
  }

  /** Records a status report. */
  setStatus(benchId: number, status: BenchDeviceStatus): void {
    this.lastStatus.set(benchId, status);
  }

  /** Sends to the bench's bridge; false if it is not connected. */
  send(benchId: number, message: HubToBridge): boolean {
    return this.online.get(benchId)?.link.send(message) ?? false;
  }

  /** Closes every bridge connection (hub shutdown). */
  closeAll(code: number, reason: string): void {
    for (const p of this.online.values()) p.link.close(code, reason);
    this.online.clear();
  }
}
