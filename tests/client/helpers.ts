import net from 'node:net';

/** Make happy-dom's window live at the test server's origin, so relative URLs and cookies work. */
export function pointWindowAt(baseUrl: string) {
  const happyDOM = (window as unknown as { happyDOM?: { setURL(url: string): void } }).happyDOM;
  if (!happyDOM) throw new Error('tests/client needs the happy-dom environment');
  happyDOM.setURL(`${baseUrl}/`);
}

/** An http:// URL on 127.0.0.1 where nothing listens: a real "server unreachable". */
export async function closedPortUrl(): Promise<string> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return `http://127.0.0.1:${port}`;
}
