/** The forecast feed (design §2.7): polling, storing each poll, its state for the board and /api/health. */
export { ForecastFeed, redactedUrl, defaultFeedMaxBytes, defaultFeedTimeoutMs, type ForecastFeedOptions, type ForecastFeedSettings, type ForecastFeedStatus, type ForecastPoll } from './forecastFeed.ts';
export { feedIsStale, nextPollDelayMs, firstRetryMs } from './pollDelay.ts';
export { fetchFeed, type FeedFetch } from './fetchFeed.ts';
