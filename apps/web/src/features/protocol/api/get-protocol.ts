// The protocol queries live in src/lib (one owner, one shape per key); the admin page reads the document.
export { protocolDocumentSchema, protocolKeys, useProtocolDocument as useProtocol } from '../../../lib/protocol';
