import { createContext, useContext } from "react";

/** The Content-Security-Policy nonce of this document, for the scripts React Router renders. */
export const NonceContext = createContext<string | undefined>(undefined);
export const useNonce = () => useContext(NonceContext);
