/// <reference lib="webworker" />
import { runMapRequest, type MapRequest } from './map-protocol';

// The orientation map takes seconds; it runs here so the page keeps drawing and answering.
addEventListener('message', (event: MessageEvent<MapRequest>) => {
  runMapRequest(event.data, (reply, transfer) => postMessage(reply, transfer));
});
