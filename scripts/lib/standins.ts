/** Local stand-ins for the real services, started on loopback by `npm start`. */
export interface StandIns {
  env: Record<string, string>;
  stop(): Promise<void>;
}

// Radiograph storage and mail come with later work; until then nothing runs here.
export async function startStandIns(_root: string): Promise<StandIns> {
  return { env: {}, async stop() {} };
}
