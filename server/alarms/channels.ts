/** The alarm channels live in `shared/` because the web app labels alarm values with them too. */
export * from '../../shared/alarms/channels.js';
