import { AccountToken } from "./account-token.entity.ts";
import { ApiToken } from "./api-token.entity.ts";
import { BeeTaxon } from "./bee-taxon.entity.ts";
import { OutboxMessage } from "./outbox-message.entity.ts";
import { PlantTaxon } from "./plant-taxon.entity.ts";
import { ProgrammeSetting } from "./programme-setting.entity.ts";
import { Session } from "./session.entity.ts";
import { SignInAttempt } from "./sign-in-attempt.entity.ts";
import { User } from "./user.entity.ts";
import { Site } from "./site.entity.ts";
import { Visit } from "./visit.entity.ts";
import { Photo } from "./photo.entity.ts";
import { Determination } from "./determination.entity.ts";
import { SeasonWindow } from "./season-window.entity.ts";
import { FloralCount } from "./floral-count.entity.ts";
import { ForageCount } from "./forage-count.entity.ts";
import { ForageMonthCount } from "./forage-month-count.entity.ts";
import { ForageBandMonthCount } from "./forage-band-month-count.entity.ts";
import { ForagePresence } from "./forage-presence.entity.ts";
import { PlantingList } from "./planting-list.entity.ts";
import { PlantingListItem } from "./planting-list-item.entity.ts";
import { StockItem } from "./stock-item.entity.ts";

/** Every entity the ORM knows; the config, the app and the tests use this one list. */
export const entities = [PlantTaxon, BeeTaxon, User, Session, ApiToken, AccountToken, OutboxMessage, SignInAttempt, ProgrammeSetting, Site, Visit, Photo, Determination, SeasonWindow, FloralCount, ForageCount, ForageMonthCount, ForageBandMonthCount, ForagePresence, PlantingList, PlantingListItem, StockItem];

export { AccountToken, ApiToken, BeeTaxon, Determination, FloralCount, ForageBandMonthCount, ForageCount, ForageMonthCount, ForagePresence, PlantingList, PlantingListItem, SeasonWindow, StockItem, Photo, Site, Visit, OutboxMessage, PlantTaxon, ProgrammeSetting, Session, SignInAttempt, User };
