/** The QR encoder, in a chunk of its own: loaded only when a scan code is shown. */
export { encode } from 'uqr';
