export declare const SECURITY_HEADERS: readonly (readonly [string, string])[];
export declare const REQUEST_ID_HEADER: string;
export declare const UNAVAILABLE_REQUESTS: unique symbol;
