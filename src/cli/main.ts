export async function main(argv: string[]): Promise<number> {
  process.stdout.write(`domtopo ${argv.join(" ")}\n`);
  return 0;
}
