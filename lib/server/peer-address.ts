/**
 * The request header that carries the connection's own peer address, set by instrumentation.ts on
 * every incoming request (a client's header of the same name is overwritten). Dependency-free, so
 * the instrumentation hook can import it before anything else loads.
 */
export const PEER_ADDRESS_HEADER = "x-jp-peer-address";
