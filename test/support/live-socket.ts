/** A signed-in WebSocket client of `/ws` that collects the server's messages. */
import WebSocket from 'ws';
import type { ServerMessage } from '../../shared/live/live-state.js';

export interface LiveSocket {
  messages: ServerMessage[];
  /** Called for every message as it arrives, with the local receive time (ms, performance clock). */
  onMessage?: (message: ServerMessage, receivedAt: number) => void;
  closed: Promise<{ code: number; reason: string }>;
  close(): void;
}

export function openLiveSocket(baseUrl: string, token: string | null): LiveSocket {
  const ws = new WebSocket(`${baseUrl.replace(/^http/, 'ws')}/ws`);
  const socket: LiveSocket = {
    messages: [],
    closed: new Promise((resolve) => ws.on('close', (code, reason) => resolve({ code, reason: reason.toString() }))),
    close: () => ws.close(),
  };
  ws.on('open', () => {
    if (token !== null) ws.send(JSON.stringify({ type: 'auth', token }));
  });
  ws.on('message', (data) => {
    const message = JSON.parse(data.toString()) as ServerMessage;
    socket.messages.push(message);
    socket.onMessage?.(message, performance.now());
  });
  return socket;
}
