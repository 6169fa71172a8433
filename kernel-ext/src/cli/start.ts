export async function startCommand(): Promise<number> {
  throw new Error("not yet");
}
