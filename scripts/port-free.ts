/** Exits 1 with a one-line message when 127.0.0.1:<port> is already taken. */
import net from "node:net";

const [portArgument, message] = process.argv.slice(2);
const port = Number(portArgument);
const server = net.createServer();
server.once("error", () => {
  console.error(message ?? `Port ${port} on 127.0.0.1 is already taken.`);
  process.exit(1);
});
server.listen(port, "127.0.0.1", () => server.close());
