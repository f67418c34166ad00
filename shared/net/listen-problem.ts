/**
 * The message for a listening socket that could not be opened, naming the environment
 * variables to change (PORT/HOST, MQTT_PORT/MQTT_HOST, SIM_CONTROL_PORT) and what to do.
 */
export function listenProblem(
  what: string,
  vars: { port: string; host?: string },
  host: string,
  port: number,
  error: { code?: string; message: string },
): string {
  const where = `${host}:${port}`;
  switch (error.code) {
    case 'EADDRINUSE':
      return `${what} cannot listen on ${where}: port ${port} is already in use (another Tiltwatch, or another program). Stop it, or set ${vars.port} to a free port.`;
    case 'EACCES':
      return `${what} cannot listen on ${where}: this user may not open port ${port}. Set ${vars.port} to a port from 1024 to 65535.`;
    case 'EADDRNOTAVAIL':
    case 'ENOTFOUND':
    case 'EAI_AGAIN':
      return vars.host
        ? `${what} cannot listen on ${where}: ${vars.host}=${JSON.stringify(host)} is not an address of this machine. Set ${vars.host} to one of its addresses (127.0.0.1, 0.0.0.0 for every interface).`
        : `${what} cannot listen on ${where}: ${error.message}`;
    default:
      return `${what} cannot listen on ${where} (${vars.port}${vars.host ? `/${vars.host}` : ''}): ${error.message}`;
  }
}
