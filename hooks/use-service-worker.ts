/** Native apps ship their code in the binary: there is no service worker to register (see the .web sibling). */
export function useServiceWorker() {}
