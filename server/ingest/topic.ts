/**
 * Reading topics: `<prefix>/<sensorKey>/reading` (design.md 3, contract). The key is what the
 * sensor was registered with: [a-z0-9-], 1 to 64 characters.
 */
export const sensorKeyPattern = /^[a-z0-9-]{1,64}$/;

export function readingTopic(prefix: string, sensorKey: string): string {
  return `${prefix}/${sensorKey}/reading`;
}

/** The subscription that covers every sensor's readings. */
export function readingTopicFilter(prefix: string): string {
  return `${prefix}/+/reading`;
}

/** The sensor key named by a reading topic, or null when the topic is not one. */
export function sensorKeyOfTopic(prefix: string, topic: string): string | null {
  if (!topic.startsWith(prefix + '/') || !topic.endsWith('/reading')) return null;
  const key = topic.slice(prefix.length + 1, topic.length - '/reading'.length);
  return sensorKeyPattern.test(key) ? key : null;
}
