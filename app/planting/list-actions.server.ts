// The saved-list page's form actions, told apart by `intent`, as one function the route calls.

import type { EntityManager } from "@mikro-orm/postgresql";
import { data, redirect } from "react-router";
import type { CurrentUser } from "../auth/current-user.server.ts";
import { deleteList, PlantingListNotFound, PlantingListRefused, renameList, revokeShare, shareList, swapListItem } from "./lists.server.ts";

export type ListActionResult = { intent: string; message?: string; error?: string; fields?: Record<string, string[]> };

/**
 * Runs one change of a saved list. Success returns a message (delete redirects to the planting
 * page); a refusal returns its message with 400 or 403; a missing list is a 404 thrown as a
 * response, like the loader's.
 */
export async function runListAction(
  em: EntityManager,
  user: Pick<CurrentUser, "id" | "roles">,
  listId: string | undefined,
  form: FormData,
): Promise<{ status: number; result: ListActionResult }> {
  const intent = String(form.get("intent") ?? "");
  const ok = (message: string) => ({ status: 200, result: { intent, message } });
  try {
    switch (intent) {
      case "swap": {
        const from = Number(form.get("from"));
        const to = Number(form.get("to"));
        if (!Number.isInteger(from) || !Number.isInteger(to)) return { status: 400, result: { intent, error: "Choose the species to swap and the one to put in its place." } };
        const swapped = await swapListItem(em, user, listId, from, to);
        return ok(`${swapped.to} now stands in place of ${swapped.from}.`);
      }
      case "rename":
        await renameList(em, user, listId, form.get("name"));
        return ok("Renamed.");
      case "share":
        await shareList(em, user, listId);
        return ok("Anyone with the link below can now read this list, without an account.");
      case "revoke":
        await revokeShare(em, user, listId);
        return ok("The share link no longer works.");
      case "delete":
        await deleteList(em, user, listId);
        throw redirect("/planting?deleted=1");
      default:
        return { status: 400, result: { intent, error: "That action is not one this page knows." } };
    }
  } catch (error) {
    if (error instanceof PlantingListRefused) return { status: error.status, result: { intent, error: error.message, fields: error.fields } };
    if (error instanceof PlantingListNotFound) throw data(error.message, { status: 404 });
    throw error;
  }
}
