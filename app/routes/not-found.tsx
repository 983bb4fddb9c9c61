import { data } from "react-router";

// Unknown addresses get the shared error page with a 404, not an empty layout.
export function loader() {
  throw data("There is nothing at this address.", { status: 404 });
}

export default function NotFound() {
  return null;
}
