/**
 * Generated from openapi/openapi.json by openapi-typescript: do not edit.
 * Regenerate with `npm run client:generate` (`npm run openapi:write` runs it too).
 */

export interface paths {
    "/healthz": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Liveness: the process answers (never shed for load) */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Liveness */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": {
                            /** @description Always "ok": an answer at all means the process lives (load and store state are on /readyz) */
                            status: string;
                        };
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/readyz": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Readiness: the store answers and the service is not shedding load */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Readiness: whether this replica should receive traffic */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": {
                            /** @description "ready" (status 200) when every check holds, "not-ready" (status 503) otherwise */
                            status: string;
                            /** @description Each readiness condition on its own, so an orchestrator log says which one failed */
                            checks: {
                                /** @description true when the store (SQLite file or PostgreSQL database) answered a ping just now */
                                store: boolean;
                                /** @description false while requests are being shed for event-loop delay, or while shutting down */
                                load: boolean;
                            };
                        };
                    };
                };
                /** @description Readiness: whether this replica should receive traffic */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": {
                            /** @description "ready" (status 200) when every check holds, "not-ready" (status 503) otherwise */
                            status: string;
                            /** @description Each readiness condition on its own, so an orchestrator log says which one failed */
                            checks: {
                                /** @description true when the store (SQLite file or PostgreSQL database) answered a ping just now */
                                store: boolean;
                                /** @description false while requests are being shed for event-loop delay, or while shutting down */
                                load: boolean;
                            };
                        };
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/metrics": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Prometheus metrics (text exposition format) */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Metrics */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "text/plain": string;
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/problems/{code}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** What a problem code means: the target of the `type` URI of every problem answer */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path: {
                    /** @description A problem code, e.g. validation (the last segment of a problem `type` URI) */
                    code: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description What a problem code means (the target of a problem `type` URI) */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": {
                            /** @description The problem code, as in the `code` member of problem answers */
                            code: string;
                            /** @description HTTP status answers with this code carry */
                            status: number;
                            /** @description What the code means and what a caller can do about it */
                            description: string;
                        };
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/analyze": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Analyse a relaxation oscillator
         * @description Steady-state frequency, duty cycle, thresholds, output levels, dwell times, time to the first edge, currents and design checks for a given circuit and amplifier.
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["Circuit"];
                };
            };
            responses: {
                /** @description Steady-state figures of one circuit, with the design checks */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Analysis"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/topologies": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** List supported topologies and their part roles */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Default Response */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": {
                            /** @description Every topology a circuit can name */
                            topologies: {
                                /** @description Names the network; the supply is its own field */
                                id: string;
                                /** @description Earlier ids still accepted as input for one release; answers use `id` */
                                deprecatedAliases: string[];
                                /** @description The network in words: which part connects which nodes */
                                description: string;
                                /** @description POST /v1/design sizes it */
                                designable: boolean;
                                /** @description true: the amplifier must have an open-drain output stage (other topologies refuse one) */
                                needsOpenDrain: boolean;
                                /** @description The part roles of this topology, each a key of `parts` */
                                roles: {
                                    /** @description The key to give this part under a circuit's `parts` (e.g. rTiming) */
                                    role: string;
                                    /** @description resistor: value in ohm; capacitor: value in farad */
                                    kind: "resistor" | "capacitor";
                                    /** @description false: the part belongs to one of two alternative arrangements (give the parts of one) */
                                    required: boolean;
                                    /** @description What the role sets: the dwell times, the switching thresholds, or the output high level (a pull-up) */
                                    purpose: "timing" | "thresholds" | "output-level";
                                    /** @description Where the part sits in the network, in words */
                                    description: string;
                                }[];
                            }[];
                        };
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/amplifiers": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * List amplifiers
         * @description Built-in technology-class archetypes (figures typical of the class) and registered amplifiers.
         */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Every amplifier a circuit can name */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["AmplifierList"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/amplifiers/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Get one amplifier */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path: {
                    /** @description Id of a built-in archetype or a registered amplifier */
                    id: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description An amplifier model with every figure (null: no such limit) */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Amplifier"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        /**
         * Register or replace an amplifier
         * @description Creates (201) or replaces (200) a registered amplifier. Omitted figures are ideal, or come from `base` (a built-in archetype). Replacing needs the current ETag in If-Match. Built-in ids answer 409.
         */
        put: {
            parameters: {
                query?: never;
                header?: {
                    /** @description ETag of the version being replaced or deleted; required when the resource exists (428 without, 412 when stale) */
                    "if-match"?: string;
                };
                path: {
                    /** @description Id of a built-in archetype or a registered amplifier */
                    id: string;
                };
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["AmplifierRegistration"];
                };
            };
            responses: {
                /** @description Replaced */
                200: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Amplifier"];
                    };
                };
                /** @description Created */
                201: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        /** @description URL of the new amplifier */
                        location?: string;
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Amplifier"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Conflict */
                409: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The If-Match ETag is stale */
                412: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description If-Match is required to change an existing resource */
                428: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        post?: never;
        /**
         * Delete a registered amplifier
         * @description Needs the current ETag in If-Match. Built-in ids answer 409.
         */
        delete: {
            parameters: {
                query?: never;
                header?: {
                    /** @description ETag of the version being replaced or deleted; required when the resource exists (428 without, 412 when stale) */
                    "if-match"?: string;
                };
                path: {
                    /** @description Id of a built-in archetype or a registered amplifier */
                    id: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Deleted */
                204: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content?: never;
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Conflict */
                409: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The If-Match ETag is stale */
                412: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description If-Match is required to change an existing resource */
                428: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/series": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** List the IEC 60063 preferred-number series */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description The IEC 60063 series the service knows */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["SeriesList"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/series/{name}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * One IEC 60063 series over a range of decades
         * @description The mantissas of one decade and the values from 10^fromDecade up to, not including, 10^(toDecade+1). Without a range the values are the decade starting at 1. Values are unit-free: read them as ohm or farad.
         */
        get: {
            parameters: {
                query?: {
                    /** @description First decade as a power of ten: 3 starts the values at 1000 (1 kΩ, or 1 nF with -9). -15..14; default 0, or toDecade when only that is given */
                    fromDecade?: string;
                    /** @description Last decade as a power of ten, inclusive: 4 ends the values below 100000. -15..14; default fromDecade */
                    toDecade?: string;
                };
                header?: never;
                path: {
                    /** @description Series name, case-insensitive: E3, E6, E12, E24, E48, E96, E192 */
                    name: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description An IEC 60063 preferred-number series over a range of decades */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Series"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/catalogues": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** List stored catalogues */
        get: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Every stored catalogue, ordered by id, without its parts */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["CatalogueList"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/catalogues/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * Get one catalogue
         * @description Send If-None-Match with a held ETag to get 304 when nothing changed.
         */
        get: {
            parameters: {
                query?: never;
                header?: {
                    /** @description ETag(s) already held */
                    "if-none-match"?: string;
                };
                path: {
                    /** @description Catalogue id: a lowercase letter or digit, then up to 63 of [a-z0-9._-] */
                    id: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description The catalogue */
                200: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Catalogue"];
                    };
                };
                /** @description Not modified since the ETag in If-None-Match */
                304: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        [name: string]: unknown;
                    };
                    content?: never;
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        /**
         * Create or replace a catalogue
         * @description Creates the catalogue (201) or replaces it (200). Replacing needs the current ETag in If-Match; `If-None-Match: *` makes the request create-only. Every part is checked before anything is stored.
         */
        put: {
            parameters: {
                query?: never;
                header?: {
                    /** @description ETag of the version being replaced or deleted; required when the resource exists (428 without, 412 when stale) */
                    "if-match"?: string;
                    /** @description * = create only: 412 if the id exists */
                    "if-none-match"?: "*";
                };
                path: {
                    /** @description Catalogue id: a lowercase letter or digit, then up to 63 of [a-z0-9._-] */
                    id: string;
                };
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["CatalogueWrite"];
                };
            };
            responses: {
                /** @description Replaced */
                200: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Catalogue"];
                    };
                };
                /** @description Created */
                201: {
                    headers: {
                        /** @description Strong entity tag of this version; send it in If-Match to change it */
                        etag?: string;
                        /** @description URL of the new catalogue */
                        location?: string;
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Catalogue"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Conflict */
                409: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The If-Match ETag is stale */
                412: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description If-Match is required to change an existing resource */
                428: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        post?: never;
        /**
         * Delete a catalogue
         * @description Needs the current ETag in If-Match.
         */
        delete: {
            parameters: {
                query?: never;
                header?: {
                    /** @description ETag of the version being replaced or deleted; required when the resource exists (428 without, 412 when stale) */
                    "if-match"?: string;
                };
                path: {
                    /** @description Catalogue id: a lowercase letter or digit, then up to 63 of [a-z0-9._-] */
                    id: string;
                };
                cookie?: never;
            };
            requestBody?: never;
            responses: {
                /** @description Deleted */
                204: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content?: never;
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Not found */
                404: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Conflict */
                409: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The If-Match ETag is stale */
                412: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description If-Match is required to change an existing resource */
                428: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/bom-checks": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Check BOM assemblies against their timing spec
         * @description For each assembly: reads the BOM value text of the parts the role map names, checks values against the declared series or catalogue, part status, dielectric, electrolytics, voltage rating, the analysis checks (output drive, common-mode range, supply range, SELV) and the worst-case frequency, duty and Monte Carlo yield against the spec. A bad assembly gets a failed result explaining why; it never fails the batch. With Accept: application/x-ndjson the results stream one JSON object per line, in request order, as they finish.
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["BomCheckRequest"];
                };
            };
            responses: {
                /** @description One result per assembly: a JSON document, or NDJSON (one BomCheckResult per line) on request */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["BomCheckResponse"];
                        "application/x-ndjson": components["schemas"]["BomCheckResult"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/fit": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Fit measurements to the circuit and diagnose the difference
         * @description From scalar scope figures and/or a capture (one or two channels: output, capacitor) to fitted effective parameters (part values, output levels, slew rate, recovery delay) with uncertainties, the pairs the data cannot tell apart, and ranked one- and two-cause explanations. Captures are analysed by IEEE Std 181 (histogram state levels, 50 % crossings, 10–90 % transitions) plus exponential fits of the capacitor segments. Send JSON (FitRequest; a CSV export may go in capture.csv), or the scope CSV itself as a text/csv body with the circuit as URL-encoded JSON in ?circuit= (and optionally ?tolerances=, ?measurements=, ?outputChannel=, ?capacitorChannel=, ?sampleIntervalS=). Bad captures (flat line, too few edges, clipped channel, mismatched lengths, missing samples, unreadable CSV) answer 422 with the reason.
         */
        post: {
            parameters: {
                query?: {
                    /** @description text/csv bodies only (required then): the circuit as URL-encoded JSON, the same object as an /v1/analyze body */
                    circuit?: string;
                    /** @description text/csv bodies only: tolerances as URL-encoded JSON */
                    tolerances?: string;
                    /** @description text/csv bodies only: scalar measurements as URL-encoded JSON, combined with the capture */
                    measurements?: string;
                    /** @description text/csv bodies only: CSV column of the output channel */
                    outputChannel?: string;
                    /** @description text/csv bodies only: CSV column of the capacitor channel */
                    capacitorChannel?: string;
                    /** @description text/csv bodies only: sample interval, s, when the file has neither a time column nor an interval entry */
                    sampleIntervalS?: string;
                    /** @description text/csv bodies only: as diagnosis.maxCauses */
                    maxCauses?: "1" | "2";
                };
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["FitRequest"];
                    "text/csv": string;
                };
            };
            responses: {
                /** @description Parameter estimates and a ranked diagnosis of the built board */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["FitResult"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/snap": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Snap ideal values to a series or catalogue
         * @description Per value: the nearest, next-lower and next-higher values of a series or catalogue with their errors, optionally the best two-part combination. Per circuit: the best joint choices of timing resistor, timing capacitor and threshold-network resistors for a frequency (and duty) target, each analysed in full.
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["SnapRequest"];
                };
            };
            responses: {
                /** @description Snapped values and jointly snapped circuits */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["SnapResponse"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/design": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Design an oscillator from a frequency target
         * @description Ranked complete designs whose every part comes from the chosen series or catalogue, each analysed in full (predicted frequency and duty, checks). Duty cycles from 10 % to 90 % by threshold placement in the single-supply divider, beyond that by diode steering (diode-steered: separate charge and discharge resistors, the duty set by their ratio; also offered inside that range when `topologies` names it). Timing resistances are bounded below by what the output can drive and above by the bias-current error. No design within the tolerance, a supply outside the amplifier rating, a target above its frequency ceiling or an empty value source answers 422 with the reason (and the closest design found in `figures`).
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["DesignRequest"];
                };
            };
            responses: {
                /** @description Ranked designs for the target */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["DesignResponse"];
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/tolerance": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Worst case, Monte Carlo and sensitivities over tolerance, temperature and supply
         * @description Corners (all of them for up to 14 varied quantities, a sensitivity-guided search beyond), a seeded Monte Carlo (uniform, or normal with σ = tolerance/3 truncated at the tolerance) with percentiles and yield against a spec, d ln f / d ln x per part with each part's share of the first-order variance. With Accept: image/svg+xml, a histogram of the Monte Carlo frequencies with the spec limits and percentiles marked. Runs in a worker thread.
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["ToleranceRequest"];
                };
            };
            responses: {
                /** @description The analysis (JSON) or its frequency histogram (SVG) */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["ToleranceResult"];
                        "image/svg+xml": string;
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Problem */
                406: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/waveform": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Sampled waveforms of a relaxation oscillator
         * @description Capacitor, output and threshold-node voltages over a number of periods on a uniform time grid, solved exactly piece by piece by the time-domain engine (slew, recovery delay, current limit, clamps and diodes included). Send `Accept: image/svg+xml` for an SVG plot instead of JSON.
         */
        post: {
            parameters: {
                query?: never;
                header?: never;
                path?: never;
                cookie?: never;
            };
            requestBody: {
                content: {
                    "application/json": components["schemas"]["WaveformRequest"];
                };
            };
            responses: {
                /** @description The samples (JSON) or their plot (SVG) */
                200: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/json": components["schemas"]["Waveform"];
                        "image/svg+xml": string;
                    };
                };
                /** @description Malformed request: a field is missing, has the wrong type or cannot be parsed */
                400: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description An API key is required */
                401: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description The API key lacks the needed scope */
                403: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Problem */
                406: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Body too large */
                413: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Unsupported media type */
                415: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Well-formed but physically impossible or unanswerable request */
                422: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Too many failed API-key attempts from this client; retry after Retry-After seconds */
                429: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
                /** @description Overloaded; retry later */
                503: {
                    headers: {
                        [name: string]: unknown;
                    };
                    content: {
                        "application/problem+json": components["schemas"]["Problem"];
                    };
                };
            };
        };
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
}
export type webhooks = Record<string, never>;
export interface components {
    schemas: {
        /** @description A component value as a number in SI base units or a value string */
        ComponentValue: number | string;
        /** @description The supply rails, relative to ground (the circuit's 0 V) */
        Supply: {
            /** @description Positive rail relative to ground, V */
            positiveV: number;
            /**
             * @description Negative rail relative to ground, V (0 for a single supply)
             * @default 0
             */
            negativeV?: number;
        };
        /** @description Amplifier figures given inline. Omitted fields are ideal, or taken from `base` when it names an archetype. */
        InlineAmplifier: {
            /** @description Id of a built-in archetype or a registered amplifier */
            base?: string;
            /** @description A name of your own for this amplifier, shown in answers */
            name?: string;
            /**
             * @description Output stage: push-pull drives both states; open-drain only sinks (the high level comes from a pull-up)
             * @enum {string}
             */
            outputStage?: "push-pull" | "open-drain";
            /** @description Minimum total supply span V+ − V− the part is rated for, V. Accepted: 0 to 1000 V. Range: the service accepts rails within ±2000 V; no amplifier needs more than 1 kV to run. */
            supplyMinV?: number;
            /** @description Maximum total supply span V+ − V− the part is rated for (not below supplyMinV), V. Accepted: 0.5 to 4000 V; null: no rating (any supply). Range: from half a volt (the lowest-voltage parts) to the widest span the service accepts (±2000 V). */
            supplyMaxV?: number | null;
            /** @description Light-load output swing limit below V+ in the high state, V. Accepted: 0 to 20 V. Range: class-typical headrooms are millivolts to about 2 V; 20 V covers high-voltage parts. */
            outputHeadroomHighV?: number;
            /** @description Light-load output swing limit above V− in the low state (saturation voltage for open drain), V. Accepted: 0 to 20 V. Range: as outputHeadroomHighV. */
            outputHeadroomLowV?: number;
            /** @description Output resistance behind the swing limit: the output sags by I·R under load, ohm. Accepted: 0, or 0.001 to 1000000 ohm. Range: 0 (ideal) or 1 mΩ to 1 MΩ; below 1 mΩ is indistinguishable from 0 and only makes the network solve ill-conditioned. */
            outputResistanceOhm?: number;
            /** @description Short-circuit / current-limit magnitude of the output, A. Accepted: 0.000001 to 100 A; null: no current limit. Range: 1 µA (nanopower parts) to 100 A. */
            outputCurrentLimitA?: number | null;
            /** @description Large-signal slew rate of the output, V/s. Accepted: 100 to 1000000000000 V/s; null: instant edges. Range: 100 V/s (0.0001 V/µs, slower than any nanopower part) to 1e12 V/s (1 V/ps). */
            slewRateVPerS?: number | null;
            /** @description Saturation-recovery (op-amp) or propagation (comparator) delay from the input crossing to the output starting to move, s. Accepted: 0 to 1 s. Range: 0 to 1 s; real parts take nanoseconds to a few hundred microseconds. */
            recoveryDelayS?: number;
            /** @description Input common-mode range lower end relative to V− (negative: extends below the rail), V. Accepted: -20 to 20 V; null: no lower limit. Range: class-typical margins are a few hundred millivolts beyond to a few volts inside the rail. */
            inputCommonModeLowMarginV?: number | null;
            /** @description Input common-mode range upper end below V+ (the range ends at V+ − margin; negative: beyond the rail), V. Accepted: -20 to 20 V; null: no upper limit. Range: as inputCommonModeLowMarginV. */
            inputCommonModeHighMarginV?: number | null;
            /** @description Input bias current flowing INTO each input pin (negative for PNP-input stages), A. Accepted: -0.0001 to 0.0001 A. Range: ±100 µA; bipolar inputs take nanoamperes to a few microamperes, CMOS picoamperes. */
            inputBiasCurrentA?: number;
            /** @description Capacitance from each input pin to ground (common mode). At the inverting input it adds to the timing capacitor; at the non-inverting input it gives the threshold node an RC of its own (a state of the pieces, solved exactly; beside a class II/III C(V) timing capacitor by collocation, to the accuracy of the model). The archetypes leave it at 0, F. Accepted: 0 to 1e-9 F. Range: real inputs have about 1 to 20 pF; up to 1 nF accepted. */
            inputCapacitanceF?: number;
            /** @description Input offset voltage referred to the non-inverting input (switching happens at N = P + offset), V. Accepted: -0.1 to 0.1 V. Range: ±100 mV; real parts are microvolts to about 10 mV. */
            inputOffsetV?: number;
            /** @description Differential input clamp: the inputs are diode-clamped beyond ±this, V. Accepted: 0.1 to 100 V; null: no clamp. Range: one diode drop (about 0.6 V) to a few in series; 0.1 V to 100 V accepted. */
            differentialClampV?: number | null;
            /** @description Supply current of the amplifier itself, A. Accepted: 0 to 1 A. Range: 0 to 1 A. */
            quiescentCurrentA?: number;
            /** @description Comparator delay versus overdrive (charge-control law, see propagation-delay.ts): after a step of overdrive Vod the delay is recoveryDelayS + k/Vod; when the input crosses the threshold at a slope S it is recoveryDelayS + √(2k/S). 0: the delay does not depend on overdrive. Two published points {overdriveV, delayS} give recoveryDelayS and k (delayLawFromPoints), V·s. Accepted: 0 to 0.001 V·s. Range: class-typical comparators: about 1e-10 to 1e-8 V·s (a few mV of overdrive costing a microsecond); up to 1 mV·s accepted. */
            overdriveDelayChargeVS?: number;
            /** @description Hysteresis built into the input stage: the output goes high when N falls below P + offset − h/2 and low when N rises above P + offset + h/2, V. Accepted: 0 to 0.2 V. Range: comparators with internal hysteresis have a few millivolts; 200 mV accepted. */
            internalHysteresisV?: number;
            /** @description Magnitude of the input offset drift with temperature (its sign differs part to part: temperature corners take both), V/K. Accepted: 0 to 0.001 V/K. Range: class-typical 0.5 to 20 µV/K; up to 1 mV/K accepted. */
            inputOffsetDriftVPerK?: number;
            /** @description Temperature rise that doubles the input bias current (JFET and CMOS gate leakage: about 10 K, common practice), K. Accepted: 1 to 1000 K; null: does not double with heat (bipolar inputs). Range: 1 K to 1000 K; leakage-dominated inputs double every 8 to 12 K. */
            inputBiasDoublingK?: number | null;
            /** @description Change of both output headrooms per kelvin (bipolar stages shrink with heat as V_BE falls, about −2 mV/K per junction), V/K. Accepted: -0.05 to 0.05 V/K. Range: ±50 mV/K; class-typical figures are a few mV/K. */
            outputHeadroomDriftVPerK?: number;
            /** @description Fractional change of the recovery/propagation delay per kelvin (0.003 = +0.3 %/K), none. Accepted: -0.05 to 0.05 none. Range: ±5 %/K; class-typical figures are a few tenths of a percent per kelvin. */
            recoveryDelayDriftPerK?: number;
        };
        /** @description An amplifier id, or inline figures */
        AmplifierSpec: string | components["schemas"]["InlineAmplifier"];
        /** @description A design check with the figures behind it (SI units) as further properties */
        Check: {
            /** @description Stable machine-readable code */
            code: string;
            /**
             * @description error: the circuit will not work as intended; warning: it works with reduced margin; caution: safety note; info: for the record
             * @enum {string}
             */
            severity: "info" | "warning" | "error" | "caution";
            /** @description What was found, in words, with the figures */
            message: string;
        } & {
            [key: string]: number | string | boolean | null;
        };
        /** @description RFC 9457 problem details */
        Problem: {
            /** @description URI reference identifying the problem type */
            type: string;
            /** @description Short summary of the problem type */
            title: string;
            /** @description HTTP status code of this answer */
            status: number;
            /** @description What went wrong with this request, in words */
            detail?: string;
            /** @description The request URL this problem is about */
            instance?: string;
            /** @description Stable machine-readable code */
            code?: string;
            /** @description One entry per bad field or parameter */
            errors?: {
                /** @description JSON pointer (RFC 6901) into the request body, or into the part of the request `in` names */
                pointer: string;
                /**
                 * @description Absent: the pointer is into the body; otherwise into the query parameters, path parameters or headers (by name)
                 * @enum {string}
                 */
                in?: "query" | "path" | "header";
                /** @description What is wrong with that field */
                detail: string;
            }[];
        } & {
            [key: string]: unknown;
        };
        /** @description A timing capacitor with its dielectric, rating, case and age; class II/III ceramics then charge along their C(V) curve */
        TimingCapacitor: {
            /** @description Nominal capacitance (at 0 V bias for class II/III ceramics): farads as a number, or a value string such as "4n7" */
            value: components["schemas"]["ComponentValue"];
            /** @description Fraction (0.1), percent text ("10%") or an IEC 60062 letter ("K") */
            tolerance?: number | string;
            /** @description EIA-198 code (C0G, X7R, Y5V...) or technology word (PP, PET, mica...). Class II/III codes bring a class-typical C(V) curve and ageing; every code brings its class's minimum insulation resistance, checked (capacitor-leakage-significant: the frequency with that leakage across the part), not applied */
            dielectric?: string;
            /** @description Rated DC voltage, V (class II/III default: 16 V); ceramic ratings start at a few volts, so below 1 V is refused as a slip */
            ratedVoltageV?: number;
            /** @description EIA inch case code (class II/III default: 0805) */
            caseSize?: "01005" | "0201" | "0402" | "0603" | "0805" | "1206" | "1210" | "1812" | "2220";
            /** @description Hours since the last de-ageing (reflow soldering de-ages a class II part); default: the 1000 h reference age */
            ageHours?: number;
            /** @description Measured or published C(V) points of the actual part (absolute farads); replace the class-typical curve */
            biasCurve?: {
                /** @description DC bias across the capacitor at this point, V (0 to 10 kV); the curve is taken as symmetric in the sign of the bias */
                voltageV: number;
                /** @description Capacitance measured or published at that bias, F (absolute, not a fraction of the nominal) */
                capacitanceF: number;
            }[];
        };
        /** @description Part values by role. Which roles a topology needs: see the topology descriptions. */
        Parts: {
            /** @description Timing resistor, output to inverting input: ohms as a number or a value string ("4k7"). Required by three-resistor-divider, two-resistor-feedback, open-drain-pullup; any other topology refuses it (400) */
            rTiming?: components["schemas"]["ComponentValue"];
            /** @description Timing capacitor, inverting input to ground: farads as a number, a value string ("4n7"), or a TimingCapacitor part with its dielectric, rating and C(V) behaviour. Required by three-resistor-divider, two-resistor-feedback, diode-steered, open-drain-pullup */
            cTiming?: components["schemas"]["ComponentValue"] | components["schemas"]["TimingCapacitor"];
            /** @description Divider resistor, V+ to non-inverting input: ohms as a number or a value string ("4k7"). Required by three-resistor-divider, open-drain-pullup; optional in diode-steered; any other topology refuses it (400) */
            rTop?: components["schemas"]["ComponentValue"];
            /** @description Divider resistor, non-inverting input to ground: ohms as a number or a value string ("4k7"). Required by three-resistor-divider, open-drain-pullup; optional in diode-steered; any other topology refuses it (400) */
            rBottom?: components["schemas"]["ComponentValue"];
            /** @description Positive-feedback resistor, output to non-inverting input: ohms as a number or a value string ("4k7"). Required by three-resistor-divider, two-resistor-feedback, diode-steered, open-drain-pullup */
            rFeedback?: components["schemas"]["ComponentValue"];
            /** @description Non-inverting input to ground (mid rail): ohms as a number or a value string ("4k7"). Required by two-resistor-feedback; optional in diode-steered; any other topology refuses it (400) */
            rGround?: components["schemas"]["ComponentValue"];
            /** @description Charge-path resistor, in series with the charge diode from the output to N: ohms as a number or a value string ("4k7"). Required by diode-steered; any other topology refuses it (400) */
            rCharge?: components["schemas"]["ComponentValue"];
            /** @description Discharge-path resistor, in series with the discharge diode from N to the output: ohms as a number or a value string ("4k7"). Required by diode-steered; any other topology refuses it (400) */
            rDischarge?: components["schemas"]["ComponentValue"];
            /** @description Pull-up resistor, V+ to the open-drain output: ohms as a number or a value string ("4k7"). Required by open-drain-pullup; any other topology refuses it (400) */
            rPullup?: components["schemas"]["ComponentValue"];
        };
        /** @description A resistive load on the output pin besides the timing and threshold networks */
        OutputLoad: {
            /** @description Load resistance on the output pin, ohm (0.001 to 1000000000000 Ω) */
            resistanceOhm: number;
            /**
             * @description Voltage the far end of the load returns to, V (default 0: a load to ground; e.g. 5 for a pull-up to a 5 V rail)
             * @default 0
             */
            returnV?: number;
        };
        /** @description Steering-diode model for diode-steered circuits: a fixed drop in series with a resistance */
        Diode: {
            /** @description Forward drop while conducting, V (0 to 5; default 0.6, a small-signal silicon diode, common practice) */
            forwardDropV?: number;
            /** @description Series resistance while conducting, ohm (default 10); below its forward drop the diode is open */
            resistanceOhm?: number;
        };
        /** @description Board and input capacitance and leakage at the oscillator nodes. Absent fields: no stray capacitance, no leakage */
        Strays: {
            /**
             * @description Board capacitance at the timing node N (inverting input) to ground, F (default 0). Adds to the timing capacitor together with the amplifier's inputCapacitanceF; the timing capacitor should be ≥ 50× their sum (check stray-capacitance-significant). Beside a class II/III capacitor it is a flat part of the node's C(V)
             * @default 0
             */
            timingNodeF?: number;
            /**
             * @description Board capacitance at the threshold node P (non-inverting input) to ground, F (default 0). Together with the amplifier's inputCapacitanceF it gives P an RC of its own (solved exactly, multi-state pieces, beside a class II/III C(V) capacitor too; check stray-capacitance-significant when it and outputNodeF move the frequency by more than 2 %)
             * @default 0
             */
            thresholdNodeF?: number;
            /**
             * @description Board capacitance at the output pin to ground, F (default 0). Makes the pin an RC of its own: an open-drain rise charges it through the pull-up, a driven pin through the output resistance (solved exactly, beside a class II/III C(V) capacitor too)
             * @default 0
             */
            outputNodeF?: number;
            /** @description Leakage resistance across the timing capacitor (N) to ground, ohm (default: absent, no leakage; e.g. a class II capacitor's insulation resistance, a humid or flux-contaminated board) */
            timingLeakageOhm?: number;
            /** @description Leakage resistance at the threshold node P to ground, ohm (default: absent, no leakage; e.g. a class II capacitor's insulation resistance, a humid or flux-contaminated board) */
            thresholdLeakageOhm?: number;
        };
        /** @description One oscillator: topology, supply, amplifier and part values */
        Circuit: {
            /** @description three-resistor-divider: rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds anywhere in the swing; rTiming (output to N) charges cTiming (N to ground). Any supply. | two-resistor-feedback: rFeedback (output to P) and rGround (P to ground) set the thresholds at ±β of the output levels; rTiming (output to N) charges cTiming (N to ground). Needs a rail below ground. | diode-steered: Separate charge and discharge paths: rCharge + diode (output to N, conducts while high) and rDischarge + diode (N to output, conducts while low) charge cTiming; thresholds from rTop + rBottom + rFeedback (single rail) or rFeedback + rGround (split rails). Diode: forward drop + resistance (`diode`, default 0.6 V, 10 Ω). | open-drain-pullup: Open-drain comparator output with rPullup (V+ to output) giving the high level; rTop (V+ to P), rBottom (P to ground), rFeedback (output to P) set the thresholds; rTiming (output to N) charges cTiming (N to ground).. Deprecated aliases, accepted for one release (answers use the current id): single-supply-divider → three-resistor-divider, split-supply → two-resistor-feedback. */
            topology: "three-resistor-divider" | "two-resistor-feedback" | "diode-steered" | "open-drain-pullup" | "single-supply-divider" | "split-supply";
            /** @description The rails the amplifier runs from and the divider networks return to */
            supply: components["schemas"]["Supply"];
            /** @description The op-amp or comparator: a built-in archetype or registered id (GET /v1/amplifiers), or inline figures; `ideal` for the textbook part */
            amplifier: components["schemas"]["AmplifierSpec"];
            /** @description Part values by role; which roles the topology needs: GET /v1/topologies */
            parts: components["schemas"]["Parts"];
            /** @description Resistive load on the output (absent: no load beyond the circuit itself) */
            load?: components["schemas"]["OutputLoad"];
            /** @description Steering-diode model, read by diode-steered only (absent: 0.6 V drop, 10 Ω) */
            diode?: components["schemas"]["Diode"];
            /** @description Board and input capacitance and leakage at the nodes (absent: none) */
            strays?: components["schemas"]["Strays"];
            /** @description Which model answers; auto picks the time-domain engine whenever slew, delay, limits or clamps matter */
            model?: "auto" | "closed-form" | "time-domain";
            /**
             * @description Largest share of the period an edge (recovery delay + slew) may take before the design counts as slew-limited; also sets frequencyCeilingHz
             * @default 0.05
             */
            edgeFractionLimit?: number;
        };
        /** @description Steady-state figures of one circuit, with the design checks */
        Analysis: {
            /** @description Topology id of the analysed circuit (the current id even when the request used a deprecated alias) */
            topology: string;
            /** @description The amplifier the answer was computed with */
            amplifier: {
                /** @description Id of the archetype or registered amplifier; "inline" when the request gave figures inline (with or without a base) */
                id: string;
                /** @description Display name: the archetype or registration name, or the inline `name` */
                name: string;
                /** @description Where the figures come from: ideal (the textbook part), class-typical (a built-in archetype, not a datasheet) or caller-supplied (inline or registered) */
                figuresBasis: string;
            };
            /**
             * @description Which model answered: the walk of exactly solved pieces; 'closed-form' is its special case with no amplifier effect active (one exponential per state)
             * @enum {string}
             */
            model: "closed-form" | "time-domain";
            /** @description Amplifier effects included in the model that produced this answer (empty: the closed-form special case) */
            modelEffects: ("slew-rate" | "recovery-delay" | "current-limit" | "input-clamp")[];
            /** @description Steady-state oscillation frequency, Hz (1 / periodS) */
            frequencyHz: number;
            /** @description Steady-state period, s: timeHighS + timeLowS */
            periodS: number;
            /** @description Fraction of the period the output is high, between 50 % crossings */
            dutyCycle: number;
            /** @description Time the output spends above its 50 % level in one period, s */
            timeHighS: number;
            /** @description Time the output spends below its 50 % level in one period, s */
            timeLowS: number;
            /** @description From power-up with the capacitor empty to the first output edge, s */
            firstEdgeS: number;
            /** @description Switching thresholds as capacitor voltages, bias-current shift included */
            thresholds: {
                /** @description Capacitor voltage at which a high output switches low, V (the decision node while the output is high) */
                upperV: number;
                /** @description Capacitor voltage at which a low output switches high, V */
                lowerV: number;
                /** @description upperV − lowerV, V: the swing the capacitor makes between decisions (before overshoot) */
                hysteresisV: number;
            };
            /** @description Output pin levels in steady state */
            output: {
                /** @description High state level as a scope shows it (IEEE Std 181-2011): the level the output settles to, V */
                highV: number;
                /** @description Low state level as a scope shows it (IEEE Std 181-2011), V */
                lowV: number;
                /** @description highV − lowV, V */
                swingV: number;
                /** @description Time-mean of the output over the high drive interval (recovery delay and slew included), V */
                meanHighV: number;
                /** @description Time-mean of the output over the low drive interval, V */
                meanLowV: number;
            };
            /** @description Output edge durations between the IEEE Std 181 10 % and 90 % reference levels */
            transitions: {
                /** @description Output 10–90 % rise time (IEEE Std 181-2011 reference levels), s (0: instant edge) */
                riseTimeS: number;
                /** @description Output 90–10 % fall time, s (0: instant edge) */
                fallTimeS: number;
            };
            /** @description The timing capacitor over the steady cycle */
            capacitor: {
                /** @description Lowest timing-capacitor voltage over the steady cycle, V (below lowerV when delay or slew lets it overshoot) */
                minV: number;
                /** @description Highest timing-capacitor voltage over the steady cycle, V (above upperV on overshoot) */
                maxV: number;
                /** @description With a voltage-dependent (class II/III) capacitor: ΔQ/ΔV over minV…maxV, the capacitance the timing effectively sees, F */
                effectiveCapacitanceF?: number;
                /** @description The C(V) curve the model used, sampled over minV…maxV */
                capacitanceCurve?: {
                    /** @description Capacitor voltage of this point, V */
                    voltageV: number;
                    /** @description Small-signal capacitance the model used at that voltage, F */
                    capacitanceF: number;
                }[];
            };
            /** @description The two output states as the model solved them (one exponential each in the closed form) */
            states: {
                /** @description While the output is high and the capacitor charges toward it */
                high: {
                    /** @description Capacitor time constant in this state, s */
                    tauS: number;
                    /** @description Capacitor voltage the state heads for, V */
                    asymptoteV: number;
                    /** @description Capacitor voltage at which the output leaves the state, V */
                    switchingV: number;
                    /** @description Output-stage source level, V (null: not driven) */
                    sourceV: number | null;
                    /** @description Time spent in the state, s */
                    dwellS: number;
                };
                /** @description While the output is low and the capacitor discharges toward it */
                low: {
                    /** @description Capacitor time constant in this state, s */
                    tauS: number;
                    /** @description Capacitor voltage the state heads for, V */
                    asymptoteV: number;
                    /** @description Capacitor voltage at which the output leaves the state, V */
                    switchingV: number;
                    /** @description Output-stage source level, V (null: not driven) */
                    sourceV: number | null;
                    /** @description Time spent in the state, s */
                    dwellS: number;
                };
            };
            /** @description How the circuit starts from power-up with the capacitor empty */
            powerUp: {
                /**
                 * @description Output state right after power-up with the capacitor empty
                 * @enum {string}
                 */
                initialState: "high" | "low";
                /** @description False when both states are consistent at power-up (then high is assumed) */
                determinate: boolean;
            };
            /** @description Currents over the steady cycle, magnitudes in A */
            currents: {
                /** @description Largest current the output sources into the networks and load over the cycle, A (compare with the output current limit) */
                outputPeakSourceA: number;
                /** @description Largest current the output sinks from the networks and load over the cycle, A */
                outputPeakSinkA: number;
                /** @description Mean current from the positive rail incl. quiescent current, A */
                supplyAverageA: number;
                /** @description Peak current from the positive rail over the cycle (networks, output stage, quiescent), A */
                supplyPeakA: number;
            };
            /** @description Input voltages over the cycle, for the common-mode and differential checks */
            inputs: {
                /** @description Lowest voltage at the non-inverting input (decision node P) over the cycle, V */
                nonInvertingMinV: number;
                /** @description Highest voltage at the non-inverting input over the cycle, V */
                nonInvertingMaxV: number;
                /** @description Lowest voltage at the inverting input (the capacitor node N) over the cycle, V */
                invertingMinV: number;
                /** @description Highest voltage at the inverting input over the cycle, V */
                invertingMaxV: number;
                /** @description Largest |P − N| over the cycle, V (compare with the amplifier's differential input limit) */
                differentialMaxV: number;
            };
            /** @description Threshold shift from input bias current, V */
            biasThresholdShiftV: number;
            /** @description Edge durations: measured by the time-domain engine, estimated from delay + swing/slew rate otherwise */
            edges?: {
                /** @description From the comparator decision to the output settled high (recovery delay + full-swing slew; with capacitance on the output pin, until the pin reaches the 90 % level of its rise: e.g. an open drain charging it through the pull-up), s; not the 10–90 % rise time */
                riseSettleS: number;
                /** @description From the comparator decision to the output settled low (with capacitance on the output pin, until the pin reaches the 10 % level of its fall), s */
                fallSettleS: number;
            };
            /** @description Present when the time-domain engine saw the output run into its current limit */
            currentLimit?: {
                /** @description Share of the period the output spends in current limit (0..1) */
                limitedFraction: number;
                /** @description Largest current the network would have drawn from the voltage drive while limited, A */
                demandPeakA: number;
            };
            /** @description Highest frequency at which both edges stay within edgeFractionLimit of the period, Hz (null: instant edges) */
            frequencyCeilingHz?: number | null;
            /** @description Share of the period an edge may take before the slew-limited check fires */
            edgeFractionLimit?: number;
            /** @description Design checks on the analysed circuit (empty: nothing to report); an error-severity check means the circuit will not work as intended */
            checks: components["schemas"]["Check"][];
        };
        /** @description An amplifier model with every figure (null: no such limit) */
        Amplifier: {
            /** @description The id to name in a circuit's `amplifier` or an inline `base`; for registrations, the id of the PUT path */
            id: string;
            /** @description Display name shown in answers */
            name: string;
            /** @description Technology class in words (e.g. "bipolar, split supply, general purpose"); a registration that gave none shows its base's */
            technologyClass: string;
            /** @description What the archetype stands for and where its figures come from; a registration that gave none shows its base's */
            description: string;
            /**
             * @description ideal: the textbook part; class-typical: figures typical of the technology class, from memory of the trade, not a datasheet; caller-supplied: a registration
             * @enum {string}
             */
            figuresBasis: "ideal" | "class-typical" | "caller-supplied";
            /**
             * @description built-in: an archetype shipped with the service (read-only); registered: stored by PUT /v1/amplifiers/{id}
             * @enum {string}
             */
            source: "built-in" | "registered";
            /**
             * @description Output stage: push-pull drives both states; open-drain only sinks (the high level comes from a pull-up)
             * @enum {string}
             */
            outputStage: "push-pull" | "open-drain";
            /** @description Minimum total supply span V+ − V− the part is rated for, V. Accepted: 0 to 1000 V. Range: the service accepts rails within ±2000 V; no amplifier needs more than 1 kV to run. */
            supplyMinV: number;
            /** @description Maximum total supply span V+ − V− the part is rated for (not below supplyMinV), V. Accepted: 0.5 to 4000 V; null: no rating (any supply). Range: from half a volt (the lowest-voltage parts) to the widest span the service accepts (±2000 V). */
            supplyMaxV: number | null;
            /** @description Light-load output swing limit below V+ in the high state, V. Accepted: 0 to 20 V. Range: class-typical headrooms are millivolts to about 2 V; 20 V covers high-voltage parts. */
            outputHeadroomHighV: number;
            /** @description Light-load output swing limit above V− in the low state (saturation voltage for open drain), V. Accepted: 0 to 20 V. Range: as outputHeadroomHighV. */
            outputHeadroomLowV: number;
            /** @description Output resistance behind the swing limit: the output sags by I·R under load, ohm. Accepted: 0, or 0.001 to 1000000 ohm. Range: 0 (ideal) or 1 mΩ to 1 MΩ; below 1 mΩ is indistinguishable from 0 and only makes the network solve ill-conditioned. */
            outputResistanceOhm: number;
            /** @description Short-circuit / current-limit magnitude of the output, A. Accepted: 0.000001 to 100 A; null: no current limit. Range: 1 µA (nanopower parts) to 100 A. */
            outputCurrentLimitA: number | null;
            /** @description Large-signal slew rate of the output, V/s. Accepted: 100 to 1000000000000 V/s; null: instant edges. Range: 100 V/s (0.0001 V/µs, slower than any nanopower part) to 1e12 V/s (1 V/ps). */
            slewRateVPerS: number | null;
            /** @description Saturation-recovery (op-amp) or propagation (comparator) delay from the input crossing to the output starting to move, s. Accepted: 0 to 1 s. Range: 0 to 1 s; real parts take nanoseconds to a few hundred microseconds. */
            recoveryDelayS: number;
            /** @description Input common-mode range lower end relative to V− (negative: extends below the rail), V. Accepted: -20 to 20 V; null: no lower limit. Range: class-typical margins are a few hundred millivolts beyond to a few volts inside the rail. */
            inputCommonModeLowMarginV: number | null;
            /** @description Input common-mode range upper end below V+ (the range ends at V+ − margin; negative: beyond the rail), V. Accepted: -20 to 20 V; null: no upper limit. Range: as inputCommonModeLowMarginV. */
            inputCommonModeHighMarginV: number | null;
            /** @description Input bias current flowing INTO each input pin (negative for PNP-input stages), A. Accepted: -0.0001 to 0.0001 A. Range: ±100 µA; bipolar inputs take nanoamperes to a few microamperes, CMOS picoamperes. */
            inputBiasCurrentA: number;
            /** @description Capacitance from each input pin to ground (common mode). At the inverting input it adds to the timing capacitor; at the non-inverting input it gives the threshold node an RC of its own (a state of the pieces, solved exactly; beside a class II/III C(V) timing capacitor by collocation, to the accuracy of the model). The archetypes leave it at 0, F. Accepted: 0 to 1e-9 F. Range: real inputs have about 1 to 20 pF; up to 1 nF accepted. */
            inputCapacitanceF: number;
            /** @description Input offset voltage referred to the non-inverting input (switching happens at N = P + offset), V. Accepted: -0.1 to 0.1 V. Range: ±100 mV; real parts are microvolts to about 10 mV. */
            inputOffsetV: number;
            /** @description Differential input clamp: the inputs are diode-clamped beyond ±this, V. Accepted: 0.1 to 100 V; null: no clamp. Range: one diode drop (about 0.6 V) to a few in series; 0.1 V to 100 V accepted. */
            differentialClampV: number | null;
            /** @description Supply current of the amplifier itself, A. Accepted: 0 to 1 A. Range: 0 to 1 A. */
            quiescentCurrentA: number;
            /** @description Comparator delay versus overdrive (charge-control law, see propagation-delay.ts): after a step of overdrive Vod the delay is recoveryDelayS + k/Vod; when the input crosses the threshold at a slope S it is recoveryDelayS + √(2k/S). 0: the delay does not depend on overdrive. Two published points {overdriveV, delayS} give recoveryDelayS and k (delayLawFromPoints), V·s. Accepted: 0 to 0.001 V·s. Range: class-typical comparators: about 1e-10 to 1e-8 V·s (a few mV of overdrive costing a microsecond); up to 1 mV·s accepted. */
            overdriveDelayChargeVS: number;
            /** @description Hysteresis built into the input stage: the output goes high when N falls below P + offset − h/2 and low when N rises above P + offset + h/2, V. Accepted: 0 to 0.2 V. Range: comparators with internal hysteresis have a few millivolts; 200 mV accepted. */
            internalHysteresisV: number;
            /** @description Magnitude of the input offset drift with temperature (its sign differs part to part: temperature corners take both), V/K. Accepted: 0 to 0.001 V/K. Range: class-typical 0.5 to 20 µV/K; up to 1 mV/K accepted. */
            inputOffsetDriftVPerK: number;
            /** @description Temperature rise that doubles the input bias current (JFET and CMOS gate leakage: about 10 K, common practice), K. Accepted: 1 to 1000 K; null: does not double with heat (bipolar inputs). Range: 1 K to 1000 K; leakage-dominated inputs double every 8 to 12 K. */
            inputBiasDoublingK: number | null;
            /** @description Change of both output headrooms per kelvin (bipolar stages shrink with heat as V_BE falls, about −2 mV/K per junction), V/K. Accepted: -0.05 to 0.05 V/K. Range: ±50 mV/K; class-typical figures are a few mV/K. */
            outputHeadroomDriftVPerK: number;
            /** @description Fractional change of the recovery/propagation delay per kelvin (0.003 = +0.3 %/K), none. Accepted: -0.05 to 0.05 none. Range: ±5 %/K; class-typical figures are a few tenths of a percent per kelvin. */
            recoveryDelayDriftPerK: number;
        };
        /** @description Every amplifier a circuit can name */
        AmplifierList: {
            /** @description Built-in archetypes first, then registered amplifiers (a stored one that no longer passes validation is left out), each with every figure */
            amplifiers: components["schemas"]["Amplifier"][];
        };
        /** @description A caller-registered amplifier model */
        AmplifierRegistration: {
            /** @description Display name shown in answers (1 to 120 characters) */
            name: string;
            /** @description Technology class in words (default: that of `base`, or the ideal part's) */
            technologyClass?: string;
            /** @description Free text for people, e.g. which part and datasheet revision the figures come from (default: that of `base`, or the ideal part's) */
            description?: string;
            /** @description Id of a built-in archetype or a registered amplifier */
            base?: string;
            /** @description Read-only (as GET shows it); ignored: the path names the amplifier */
            id?: string;
            /**
             * @description Read-only (as GET shows it); ignored
             * @enum {string}
             */
            source?: "built-in" | "registered";
            /**
             * @description Read-only (as GET shows it); ignored: registered figures are caller-supplied
             * @enum {string}
             */
            figuresBasis?: "ideal" | "class-typical" | "caller-supplied";
            /**
             * @description Output stage: push-pull drives both states; open-drain only sinks (the high level comes from a pull-up)
             * @enum {string}
             */
            outputStage?: "push-pull" | "open-drain";
            /** @description Minimum total supply span V+ − V− the part is rated for, V. Accepted: 0 to 1000 V. Range: the service accepts rails within ±2000 V; no amplifier needs more than 1 kV to run. */
            supplyMinV?: number;
            /** @description Maximum total supply span V+ − V− the part is rated for (not below supplyMinV), V. Accepted: 0.5 to 4000 V; null: no rating (any supply). Range: from half a volt (the lowest-voltage parts) to the widest span the service accepts (±2000 V). */
            supplyMaxV?: number | null;
            /** @description Light-load output swing limit below V+ in the high state, V. Accepted: 0 to 20 V. Range: class-typical headrooms are millivolts to about 2 V; 20 V covers high-voltage parts. */
            outputHeadroomHighV?: number;
            /** @description Light-load output swing limit above V− in the low state (saturation voltage for open drain), V. Accepted: 0 to 20 V. Range: as outputHeadroomHighV. */
            outputHeadroomLowV?: number;
            /** @description Output resistance behind the swing limit: the output sags by I·R under load, ohm. Accepted: 0, or 0.001 to 1000000 ohm. Range: 0 (ideal) or 1 mΩ to 1 MΩ; below 1 mΩ is indistinguishable from 0 and only makes the network solve ill-conditioned. */
            outputResistanceOhm?: number;
            /** @description Short-circuit / current-limit magnitude of the output, A. Accepted: 0.000001 to 100 A; null: no current limit. Range: 1 µA (nanopower parts) to 100 A. */
            outputCurrentLimitA?: number | null;
            /** @description Large-signal slew rate of the output, V/s. Accepted: 100 to 1000000000000 V/s; null: instant edges. Range: 100 V/s (0.0001 V/µs, slower than any nanopower part) to 1e12 V/s (1 V/ps). */
            slewRateVPerS?: number | null;
            /** @description Saturation-recovery (op-amp) or propagation (comparator) delay from the input crossing to the output starting to move, s. Accepted: 0 to 1 s. Range: 0 to 1 s; real parts take nanoseconds to a few hundred microseconds. */
            recoveryDelayS?: number;
            /** @description Input common-mode range lower end relative to V− (negative: extends below the rail), V. Accepted: -20 to 20 V; null: no lower limit. Range: class-typical margins are a few hundred millivolts beyond to a few volts inside the rail. */
            inputCommonModeLowMarginV?: number | null;
            /** @description Input common-mode range upper end below V+ (the range ends at V+ − margin; negative: beyond the rail), V. Accepted: -20 to 20 V; null: no upper limit. Range: as inputCommonModeLowMarginV. */
            inputCommonModeHighMarginV?: number | null;
            /** @description Input bias current flowing INTO each input pin (negative for PNP-input stages), A. Accepted: -0.0001 to 0.0001 A. Range: ±100 µA; bipolar inputs take nanoamperes to a few microamperes, CMOS picoamperes. */
            inputBiasCurrentA?: number;
            /** @description Capacitance from each input pin to ground (common mode). At the inverting input it adds to the timing capacitor; at the non-inverting input it gives the threshold node an RC of its own (a state of the pieces, solved exactly; beside a class II/III C(V) timing capacitor by collocation, to the accuracy of the model). The archetypes leave it at 0, F. Accepted: 0 to 1e-9 F. Range: real inputs have about 1 to 20 pF; up to 1 nF accepted. */
            inputCapacitanceF?: number;
            /** @description Input offset voltage referred to the non-inverting input (switching happens at N = P + offset), V. Accepted: -0.1 to 0.1 V. Range: ±100 mV; real parts are microvolts to about 10 mV. */
            inputOffsetV?: number;
            /** @description Differential input clamp: the inputs are diode-clamped beyond ±this, V. Accepted: 0.1 to 100 V; null: no clamp. Range: one diode drop (about 0.6 V) to a few in series; 0.1 V to 100 V accepted. */
            differentialClampV?: number | null;
            /** @description Supply current of the amplifier itself, A. Accepted: 0 to 1 A. Range: 0 to 1 A. */
            quiescentCurrentA?: number;
            /** @description Comparator delay versus overdrive (charge-control law, see propagation-delay.ts): after a step of overdrive Vod the delay is recoveryDelayS + k/Vod; when the input crosses the threshold at a slope S it is recoveryDelayS + √(2k/S). 0: the delay does not depend on overdrive. Two published points {overdriveV, delayS} give recoveryDelayS and k (delayLawFromPoints), V·s. Accepted: 0 to 0.001 V·s. Range: class-typical comparators: about 1e-10 to 1e-8 V·s (a few mV of overdrive costing a microsecond); up to 1 mV·s accepted. */
            overdriveDelayChargeVS?: number;
            /** @description Hysteresis built into the input stage: the output goes high when N falls below P + offset − h/2 and low when N rises above P + offset + h/2, V. Accepted: 0 to 0.2 V. Range: comparators with internal hysteresis have a few millivolts; 200 mV accepted. */
            internalHysteresisV?: number;
            /** @description Magnitude of the input offset drift with temperature (its sign differs part to part: temperature corners take both), V/K. Accepted: 0 to 0.001 V/K. Range: class-typical 0.5 to 20 µV/K; up to 1 mV/K accepted. */
            inputOffsetDriftVPerK?: number;
            /** @description Temperature rise that doubles the input bias current (JFET and CMOS gate leakage: about 10 K, common practice), K. Accepted: 1 to 1000 K; null: does not double with heat (bipolar inputs). Range: 1 K to 1000 K; leakage-dominated inputs double every 8 to 12 K. */
            inputBiasDoublingK?: number | null;
            /** @description Change of both output headrooms per kelvin (bipolar stages shrink with heat as V_BE falls, about −2 mV/K per junction), V/K. Accepted: -0.05 to 0.05 V/K. Range: ±50 mV/K; class-typical figures are a few mV/K. */
            outputHeadroomDriftVPerK?: number;
            /** @description Fractional change of the recovery/propagation delay per kelvin (0.003 = +0.3 %/K), none. Accepted: -0.05 to 0.05 none. Range: ±5 %/K; class-typical figures are a few tenths of a percent per kelvin. */
            recoveryDelayDriftPerK?: number;
        };
        /** @description An IEC 60063 preferred-number series over a range of decades */
        Series: {
            /** @description Canonical series name (E3 ... E192) */
            name: string;
            /** @description Values in one decade: the number in the series name (E24: 24) */
            valuesPerDecade: number;
            /** @description Figures each value carries: 2 for E3..E24, 3 for E48..E192 (IEC 60063) */
            significantFigures: number;
            /** @description Tolerance usually sold with the series, as a fraction (0.05 = 5 %) */
            tolerance: number;
            /**
             * @description The tolerance is trade practice, not part of IEC 60063
             * @enum {string}
             */
            toleranceBasis: "common practice";
            /** @description One decade as mantissas in [1, 10), ascending */
            mantissas: number[];
            /** @description First decade listed, as a power of ten (3: from 1 k) */
            fromDecade: number;
            /** @description Last decade listed, as a power of ten (4: values below 100 k) */
            toDecade: number;
            /** @description Every series value from 10^fromDecade up to (not including) 10^(toDecade+1), ascending */
            values: number[];
        };
        /** @description The IEC 60063 series the service knows */
        SeriesList: {
            /** @description Every series, fewest values per decade first */
            series: {
                /** @description Canonical series name (E3 ... E192) */
                name: string;
                /** @description Values in one decade */
                valuesPerDecade: number;
                /** @description Tolerance usually sold with the series, as a fraction (common practice) */
                tolerance: number;
            }[];
        };
        /** @description One approved part */
        CataloguePart: {
            /** @description What the part is; sets the unit of value (ohm or farad) */
            kind: "resistor" | "capacitor";
            /** @description Nominal value: ohms or farads as a number, or a value string such as "4k7" or "100n" */
            value: components["schemas"]["ComponentValue"];
            /** @description Tolerance as a fraction (0.01 = 1 %) */
            tolerance: number;
            /** @description Temperature coefficient, ppm/K (resistors; capacitors when known explicitly) */
            tempcoPpmPerK?: number;
            /** @description Capacitors only: EIA-198 ceramic code (C0G, X7R, U2J...) or a technology (PP, PET, PPS, PEN, mica, tantalum, electrolytic) */
            dielectric?: string;
            /** @description Rated voltage, V (1 V to 10 kV) */
            ratedVoltageV?: number;
            /** @description The owner's own part number; unique within the catalogue */
            partNumber: string;
            /** @description Package or case, e.g. 0603 */
            package?: string;
            /** @description not-for-new-designs parts are kept for BOM checks but never chosen by design or snap */
            status: "preferred" | "active" | "not-for-new-designs";
        };
        /** @description A parts catalogue as written by its owner */
        CatalogueWrite: {
            /** @description Display name (default: none; the id names the catalogue) */
            name?: string;
            /** @description Free text for people, e.g. the approval list and its revision */
            description?: string;
            /** @description The whole parts list (1 to 20000); a PUT replaces the previous list */
            parts: components["schemas"]["CataloguePart"][];
        };
        /** @description A stored part, with its value as the service read it */
        CataloguePartRecord: {
            /** @description What the part is; sets the unit of value (ohm or farad) */
            kind: "resistor" | "capacitor";
            /** @description Nominal value: ohms or farads as a number, or a value string such as "4k7" or "100n" */
            value: components["schemas"]["ComponentValue"];
            /** @description Tolerance as a fraction (0.01 = 1 %) */
            tolerance: number;
            /** @description Temperature coefficient, ppm/K (resistors; capacitors when known explicitly) */
            tempcoPpmPerK?: number;
            /** @description Capacitors only: EIA-198 ceramic code (C0G, X7R, U2J...) or a technology (PP, PET, PPS, PEN, mica, tantalum, electrolytic) */
            dielectric?: string;
            /** @description Rated voltage, V (1 V to 10 kV) */
            ratedVoltageV?: number;
            /** @description The owner's own part number; unique within the catalogue */
            partNumber: string;
            /** @description Package or case, e.g. 0603 */
            package?: string;
            /** @description not-for-new-designs parts are kept for BOM checks but never chosen by design or snap */
            status: "preferred" | "active" | "not-for-new-designs";
            /** @description The value in SI base units as the service read it: ohm for resistors, farad for capacitors */
            valueSi: number;
        };
        /** @description A stored parts catalogue */
        Catalogue: {
            /** @description Catalogue id, as in the path */
            id: string;
            /** @description 1 on creation, +1 on every update */
            version: number;
            /** @description Same as the ETag header: send it in If-Match to update or delete */
            etag: string;
            /**
             * Format: date-time
             * @description When the first PUT stored it (RFC 3339, UTC)
             */
            createdAt: string;
            /**
             * Format: date-time
             * @description When the last PUT changed it (RFC 3339, UTC); equals createdAt until then
             */
            updatedAt: string;
            /** @description Display name (absent when the owner gave none) */
            name?: string;
            /** @description Free text from the owner (absent when none was given) */
            description?: string;
            /** @description The stored parts, in the order they were written */
            parts: components["schemas"]["CataloguePartRecord"][];
        };
        /** @description A stored catalogue without its parts */
        CatalogueSummary: {
            /** @description Catalogue id, as in the path */
            id: string;
            /** @description 1 on creation, +1 on every update */
            version: number;
            /** @description Same as the ETag header: send it in If-Match to update or delete */
            etag: string;
            /**
             * Format: date-time
             * @description When the first PUT stored it (RFC 3339, UTC)
             */
            createdAt: string;
            /**
             * Format: date-time
             * @description When the last PUT changed it (RFC 3339, UTC); equals createdAt until then
             */
            updatedAt: string;
            /** @description Display name (absent when the owner gave none) */
            name?: string;
            /** @description How many parts of each kind the catalogue holds */
            partCounts: {
                /** @description Parts in the catalogue */
                total: number;
                /** @description Parts of kind resistor */
                resistors: number;
                /** @description Parts of kind capacitor */
                capacitors: number;
                /** @description Parts with status not-for-new-designs (included in the totals) */
                notForNewDesigns: number;
            };
        };
        /** @description Every stored catalogue, ordered by id, without its parts */
        CatalogueList: {
            /** @description Ordered by id */
            catalogues: components["schemas"]["CatalogueSummary"][];
        };
        /** @description One BOM line as the BOM carries it */
        BomLine: {
            /** @description Reference designator, or several that share the line ("R3, R7" or "R3 R7"); compared trimmed and case-blind */
            refdes: string;
            /** @description The value column as the BOM carries it: IEC 60062 RKM ("4K7", "R47", "4n7"), numeric codes ("103", "4702"), EIA-96 ("01C"), SI form ("10nF"), with tolerance, voltage, dielectric, tempco and package in any order ("3K3 1% 0603", "10nF 50V C0G 5%", "4u7/16V X5R", "103 K"). Empty or null: no value. */
            value: string | null;
            /** @description The owner's part number; looked up in the catalogue when one is named */
            partNumber?: string;
            /** @description Free text; tolerance, voltage, dielectric, tempco and package missing from the value are read from it */
            description?: string;
        };
        /** @description The board's rails and their regulation band */
        BomSupply: {
            /** @description Nominal positive rail relative to ground, V */
            positiveV: number;
            /**
             * @description Nominal negative rail relative to ground, V (0 for a single supply)
             * @default 0
             */
            negativeV?: number;
            /**
             * @description Regulation band of both rails as a fraction (0.05: each rail ±5 %); the checks run at both ends
             * @default 0
             */
            tolerance?: number;
        };
        /** @description Ambient temperature range of the board, °C */
        BomTemperatureRange: {
            /** @description Lowest ambient temperature, °C */
            minC: number;
            /** @description Highest ambient temperature, °C */
            maxC: number;
        };
        /** @description What the clock must meet for the assembly to pass */
        BomSpec: {
            /** @description Target frequency, Hz (0.001 to 100000000 Hz) */
            frequencyHz: number;
            /** @description Allowed deviation from frequencyHz as a fraction (0.05 = ±5 %) */
            frequencyTolerance: number;
            /** @description Lowest allowed duty cycle, fraction of the period high */
            dutyMin?: number;
            /** @description Highest allowed duty cycle, fraction of the period high */
            dutyMax?: number;
            /** @description Minimum fraction of boards inside the spec (Monte Carlo); omit for no yield rule */
            minimumYield?: number;
        };
        /** @description One board revision: its BOM lines, which line fills which role, and its spec */
        BomAssembly: {
            /** @description The caller's id for the assembly (echoed in its result) */
            id: string;
            /** @description BOM lines; only those the role map names are checked */
            lines: components["schemas"]["BomLine"][];
            /** @description Topology role -> reference designator, e.g. {"rTiming": "R12", "cTiming": "C4"} */
            roles: {
                [key: string]: string;
            };
            /** @description Topology id: three-resistor-divider, two-resistor-feedback, diode-steered, open-drain-pullup (an unknown one fails this assembly only) */
            topology: string;
            /** @description The amplifier fitted on the board: an archetype or registered id, or inline figures (an unknown id fails this assembly only) */
            amplifier: components["schemas"]["AmplifierSpec"];
            /** @description The rails of the board and their regulation band */
            supply: components["schemas"]["BomSupply"];
            /** @description Board and input capacitance and leakage at the nodes (absent: none); every analysis of the assembly includes them */
            strays?: components["schemas"]["Strays"];
            /** @description Ambient range the board must work over (absent: no temperature drift is applied, tolerances alone) */
            temperature?: components["schemas"]["BomTemperatureRange"];
            /** @description Years the board must keep its clock in spec (default 0: no ageing). A class II/III timing capacitor (its dielectric from the BOM line) loses capacitance by the log-decade law from the reference age of its marked value over these years, in the worst case (start and end of service) and the Monte Carlo yield (uniform age), as in POST /v1/tolerance */
            serviceLifeYears?: number;
            /** @description What the clock must meet for the assembly to pass */
            spec: components["schemas"]["BomSpec"];
            /** @description Id of a stored parts catalogue to check part numbers, values and status against */
            catalogue?: string;
            /** @description The preferred-number series the design uses: one for every role ("E24"), or per role ({"rTiming": "E96", "cTiming": "E6"}) */
            series?: string | {
                [key: string]: string;
            };
            /** @description Tolerances for lines whose value text states none */
            assumedTolerance?: {
                /** @description Tolerance assumed for resistors that state none (default 0.05) */
                resistor?: number;
                /** @description Tolerance assumed for capacitors that state none (default 0.1) */
                capacitor?: number;
            };
        };
        /** @description How deeply to check and what fails an assembly */
        BomCheckOptions: {
            /**
             * @description full: worst case and, where a minimum yield is given, Monte Carlo; worst-case: no Monte Carlo (faster)
             * @default full
             */
            mode?: "full" | "worst-case";
            /**
             * @description Lowest rule severity that fails an assembly
             * @default error
             */
            failOn?: "error" | "warning";
            /**
             * @description Monte Carlo samples per assembly. An assembly whose yield run is projected (from the time of its first samples) past half the task deadline is not run: its yield rule is yield-not-evaluated, naming the cost per evaluation and the samples that would fit
             * @default 500
             */
            monteCarloSamples?: number;
            /**
             * @description Monte Carlo seed (same seed, same figures)
             * @default 1
             */
            seed?: number;
        };
        /** @description A batch of assemblies to check */
        BomCheckRequest: {
            /** @description Assemblies to check, 1 to 5000; each passes or fails on its own */
            assemblies: components["schemas"]["BomAssembly"][];
            /** @description How deeply to check and what fails an assembly (absent: every option at its default) */
            options?: components["schemas"]["BomCheckOptions"];
        };
        /** @description One rule result for an assembly */
        BomRule: {
            /** @description Stable rule code: role-unassigned, role-unknown, refdes-missing, refdes-duplicated, topology-unknown, amplifier-unresolved, catalogue-unavailable, series-unknown, spec-inconsistent, value-read, value-unreadable, value-text-leftover, tolerance-assumed, tempco-assumed, value-off-series, part-number-unlisted, value-disagrees-with-catalogue, value-not-in-catalogue, part-not-for-new-designs, dielectric-unfit-for-timing, electrolytic-in-timing-path, dielectric-unstated, voltage-rating-below-supply, voltage-rating-unstated, temperature-beyond-part-rating, bias-derating, bias-derating-leaves-spec, circuit-rejected, supply-outside-amplifier-range, output-drive-exceeded, inputs-outside-common-mode, input-clamp-conducts, bias-shifts-thresholds, selv-caution, stored-energy-caution, dynamics-approximated, stray-capacitance-significant, capacitor-leakage-significant, frequency-within-spec, frequency-outside-spec, duty-within-spec, duty-outside-spec, yield-met, yield-below-minimum, yield-not-evaluated, evaluation-failed; checks the analysis adds later arrive as analysis-<code> */
            code: string;
            /** @description error: the board will not meet its spec or work as intended; warning: it works with reduced margin; caution: safety note; info: for the record */
            severity: "error" | "warning" | "caution" | "info";
            /** @description What was found, in words with the figures */
            message: string;
            /** @description The designator the rule is about */
            refdes?: string;
            /** @description The topology role that designator fills */
            role?: string;
            /** @description The figures behind the message, SI units (null: no limit / not known) */
            figures: {
                [key: string]: number | string | boolean | null;
            };
            /** @description value-read only: what the value text was read as, in words */
            understood?: string[];
        };
        /** @description The verdict on one assembly */
        BomCheckResult: {
            /** @description The assembly id from the request */
            id: string;
            /** @description Position of the assembly in the request */
            index: number;
            /** @description False when any rule at or above options.failOn severity fired */
            pass: boolean;
            /** @description Rule results by severity */
            counts: {
                /** @description Rule results of severity error */
                error: number;
                /** @description Rule results of severity warning */
                warning: number;
                /** @description Rule results of severity caution */
                caution: number;
                /** @description Rule results of severity info */
                info: number;
            };
            /** @description Every rule result for the assembly (passing checks report as info) */
            rules: components["schemas"]["BomRule"][];
        };
        /** @description Verdicts on a batch of assemblies */
        BomCheckResponse: {
            /** @description One result per assembly, in request order */
            results: components["schemas"]["BomCheckResult"][];
            /** @description Totals over the batch */
            summary: {
                /** @description Assemblies checked */
                assemblies: number;
                /** @description Assemblies with pass true */
                passed: number;
                /** @description Assemblies with pass false */
                failed: number;
            };
        };
        /** @description A measured figure: a number, or {value, uncertainty} with its standard uncertainty (1σ) */
        ScalarMeasurement: number | {
            /** @description The measured value, in the unit the figure's name states */
            value: number;
            /** @description Standard uncertainty (1σ), same unit as the value (absent: the figure's default) */
            uncertainty?: number;
        };
        /** @description Scalar figures read off a scope, each with its uncertainty */
        FitMeasurements: {
            /** @description Oscillation frequency, Hz (default uncertainty 0.1 %) */
            frequencyHz?: components["schemas"]["ScalarMeasurement"];
            /** @description Output-high share of the period between 50 % crossings, 0..1 (default uncertainty 0.005) */
            dutyCycle?: components["schemas"]["ScalarMeasurement"];
            /** @description Lowest capacitor voltage (its turning point, overshoot included), V (default 1 % + 20 mV) */
            capacitorMinV?: components["schemas"]["ScalarMeasurement"];
            /** @description Highest capacitor voltage (its turning point, overshoot included), V (default 1 % + 20 mV) */
            capacitorMaxV?: components["schemas"]["ScalarMeasurement"];
            /** @description Settled output high level, V (default 1 % + 20 mV) */
            outputHighV?: components["schemas"]["ScalarMeasurement"];
            /** @description Settled output low level, V (default 1 % + 20 mV) */
            outputLowV?: components["schemas"]["ScalarMeasurement"];
            /** @description 10–90 % rise time of the output, s (default 5 %) */
            riseTimeS?: components["schemas"]["ScalarMeasurement"];
            /** @description 90–10 % fall time of the output, s (default 5 %) */
            fallTimeS?: components["schemas"]["ScalarMeasurement"];
            /** @description Time constant of the charging capacitor, s (default 5 %) */
            capacitorRisingTauS?: components["schemas"]["ScalarMeasurement"];
            /** @description Time constant of the discharging capacitor, s (default 5 %) */
            capacitorFallingTauS?: components["schemas"]["ScalarMeasurement"];
            /** @description Share of the period the capacitor spends above the middle of its range, 0..1 (default uncertainty 0.005) */
            capacitorAboveMidShare?: components["schemas"]["ScalarMeasurement"];
        };
        /** @description A scope capture: one or two channels as arrays with a sample interval or time column, or a CSV export */
        FitCapture: {
            /** @description Sample interval, s, from 1 fs to 1000 s (or give timeS) */
            sampleIntervalS?: number;
            /** @description Sample instants, s, strictly increasing (wins over sampleIntervalS) */
            timeS?: (number | null)[];
            /** @description Amplifier output channel, V (null = missing sample, rejected with 422) */
            output?: (number | null)[];
            /** @description Timing-capacitor channel, V (null = missing sample, rejected with 422) */
            capacitor?: (number | null)[];
            /** @description A scope CSV export as text, instead of the arrays: header/metadata lines, a time column (or a sample-interval entry) and channel columns, units in the header ("Time (us)", "CH1 [mV]" or a units row); tab, semicolon or comma separated, decimal commas accepted. The same text can be sent as a text/csv body, see the operation description. */
            csv?: string;
            /** @description CSV column name of the output channel (default: by name hints, then CH1) */
            outputChannel?: string;
            /** @description CSV column name of the capacitor channel (default: by name hints, then CH2) */
            capacitorChannel?: string;
            /** @description Vertical accuracy, fraction: σ = f·|reading| ⊕ f·swing ⊕ half an ADC step (default 0.005) */
            verticalUncertainty?: number;
            /** @description Time-base accuracy, fraction (default 5e-5) */
            timebaseUncertainty?: number;
        };
        /** @description Part tolerances by role as fractions from 1e-4 (0.01 %) to below 1 (0.05 = 5 %); defaults 1 % for resistors and 10 % for capacitors. Read as ±3σ. */
        Tolerances: {
            [key: string]: number;
        };
        /** @description A circuit and what was measured on the built board */
        FitRequest: {
            /** @description The circuit as designed (nominal values), as a POST /v1/analyze body */
            circuit: components["schemas"]["Circuit"];
            /** @description How far each part may be from nominal before it counts as off (absent: 1 % resistors, 10 % capacitors) */
            tolerances?: components["schemas"]["Tolerances"];
            /** @description Figures read off the bench; give these, a capture, or both */
            measurements?: components["schemas"]["FitMeasurements"];
            /** @description Sampled scope channels the figures are read from (IEEE Std 181); give this, measurements, or both */
            capture?: components["schemas"]["FitCapture"];
            /** @description How many explanations to rank and how complex they may be (absent: the defaults) */
            diagnosis?: {
                /** @description Explanations with up to this many causes (default 2) */
                maxCauses?: 1 | 2;
                /** @description How many ranked explanations to return (default 8) */
                maxExplanations?: number;
            };
        };
        /** @description What the measurements say about one effective parameter */
        ParameterEstimate: {
            /** @description Part role (from the topology), amplifier effect (outputHighV, outputLowV, slewRateVPerS, recoveryDelayS, outputResistanceOhm, inputOffsetV, inputBiasCurrentA), supplyScale, or a stray that the circuit does not declare (strayTimingNodeF, leakageTimingNodeOhm at the timing node N, strayThresholdNodeF at the threshold node P, strayOutputNodeF at the output pin; diagnosis causes only) */
            parameter: string;
            /** @description part: a passive part of the topology; amplifier: an amplifier figure; supply: the common scale of the rails; stray: a capacitance (0.1–220 pF) or leakage (100 kΩ–100 GΩ) at the timing node N, a capacitance at the threshold node P (0.1–220 pF) or at the output pin (0.1 pF–2.2 nF), beyond what circuit.strays declares (diagnosis causes only) */
            kind: "part" | "amplifier" | "supply" | "stray";
            /** @description Unit of nominal, estimate, the standard deviations and shift ("1": dimensionless) */
            unit: "ohm" | "F" | "V" | "V/s" | "s" | "A" | "1";
            /** @description Nominal value (null: no limit, e.g. an instant slew rate) */
            nominal: number | null;
            /** @description MAP estimate (null: no limit) */
            estimate: number | null;
            /** @description Posterior standard deviation, first order (null: unbounded) */
            standardDeviation: number | null;
            /** @description Prior standard deviation at nominal */
            priorStandardDeviation: number | null;
            /** @description Part tolerance, fraction */
            tolerance?: number;
            /** @description estimate − nominal (slew rate: in its reciprocal, s/V; a leakage where none is declared: its conductance, S) */
            shift: number;
            /** @description estimate/nominal − 1 (parts) */
            relativeShift?: number;
            /** @description Shift over the tolerance (parts) or over the 3σ prior spread (amplifier effects) */
            shiftInTolerances: number;
            /** @description Posterior over prior width; near 1: the data say nothing about this parameter */
            posteriorToPriorSd: number;
        };
        /** @description A ranked hypothesis of what is off on the board */
        FitExplanation: {
            /** @description Position in the ranking, 1 = most plausible */
            rank: number;
            /** @description Stable id of the hypothesis, e.g. off:rTiming, decade-slip:cTiming×10, swapped:rTop/rBottom, stray:timingNodeF, stray:outputNodeF */
            hypothesis: string;
            /** @description The one or two effects this explanation blames */
            causes: {
                /** @description Part role (from the topology), amplifier effect (outputHighV, outputLowV, slewRateVPerS, recoveryDelayS, outputResistanceOhm, inputOffsetV, inputBiasCurrentA), supplyScale, or a stray that the circuit does not declare (strayTimingNodeF, leakageTimingNodeOhm at the timing node N, strayThresholdNodeF at the threshold node P, strayOutputNodeF at the output pin; diagnosis causes only) */
                parameter: string;
                /** @description part: a passive part of the topology; amplifier: an amplifier figure; supply: the common scale of the rails; stray: a capacitance (0.1–220 pF) or leakage (100 kΩ–100 GΩ) at the timing node N, a capacitance at the threshold node P (0.1–220 pF) or at the output pin (0.1 pF–2.2 nF), beyond what circuit.strays declares (diagnosis causes only) */
                kind: "part" | "amplifier" | "supply" | "stray";
                /** @description Unit of nominal, estimate, the standard deviations and shift ("1": dimensionless) */
                unit: "ohm" | "F" | "V" | "V/s" | "s" | "A" | "1";
                /** @description Nominal value (null: no limit, e.g. an instant slew rate) */
                nominal: number | null;
                /** @description MAP estimate (null: no limit) */
                estimate: number | null;
                /** @description Posterior standard deviation, first order (null: unbounded) */
                standardDeviation: number | null;
                /** @description Prior standard deviation at nominal */
                priorStandardDeviation: number | null;
                /** @description Part tolerance, fraction */
                tolerance?: number;
                /** @description estimate − nominal (slew rate: in its reciprocal, s/V; a leakage where none is declared: its conductance, S) */
                shift: number;
                /** @description estimate/nominal − 1 (parts) */
                relativeShift?: number;
                /** @description Shift over the tolerance (parts) or over the 3σ prior spread (amplifier effects) */
                shiftInTolerances: number;
                /** @description Posterior over prior width; near 1: the data say nothing about this parameter */
                posteriorToPriorSd: number;
                /** @description The fitted shift stays inside the part's tolerance (or the 3σ prior spread of an amplifier effect) */
                withinTolerance: boolean;
                /** @description off: the effect departs from nominal (fitted within its physical range); stray: a capacitance or leakage at the timing node N, or a capacitance at the threshold node P or at the output pin, that the circuit does not declare (fitted within its window); the others: a wrong part fitted — the neighbouring series value, a decade slip, two roles swapped, or a timing capacitor of another dielectric class (a class II ceramic in place of a flat part, its DC-bias C(V) fitted on the class-typical law within the span class II and III parts cover, or the reverse; its marked value within a class II tolerance) */
                fault: "off" | "neighbouring-value" | "decade-slip" | "swapped" | "other-dielectric" | "stray";
                /** @description e.g. "cTiming +8.9 % (4.7 nF -> 5.12 nF), inside its 10 % tolerance" */
                text: string;
            }[];
            /** @description Posterior probability among the nominal circuit and the explanations listed (they sum to one with verdict.nominalScore) */
            score: number;
            /** @description Laplace-approximated log evidence times prior */
            logEvidence: number;
            /** @description χ² of the measurements this explanation leaves, the other effects allowed their tolerances */
            residualChiSquare: number;
            /** @description Measurements the χ² figures count */
            measurementCount: number;
            /** @description Residual χ² within its 95 % bound */
            accountsForMeasurements: boolean;
            /** @description Residual χ² within its 1e-3 bound; one that fails never outranks one that passes */
            passesGoodnessOfFit: boolean;
            /** @description How well the explanation reproduces each measurement */
            residuals: {
                /** @description The measured figure */
                measurement: "frequencyHz" | "dutyCycle" | "capacitorMinV" | "capacitorMaxV" | "outputHighV" | "outputLowV" | "riseTimeS" | "fallTimeS" | "capacitorRisingTauS" | "capacitorFallingTauS" | "capacitorAboveMidShare";
                /** @description The measured value, in the unit the name states */
                measured: number;
                /** @description What this explanation predicts for it */
                predicted: number;
                /** @description Standard uncertainty used, same unit */
                uncertainty: number;
                /** @description (predicted − measured)/uncertainty */
                normalized: number;
            }[];
            /** @description The explanation in one sentence with its figures */
            summary: string;
        };
        /** @description Parameter estimates and a ranked diagnosis of the built board */
        FitResult: {
            /** @description What predicts the figures during the fit */
            forwardModel: string;
            /** @description What the forward model predicts with every parameter at nominal */
            nominal: {
                /** @description Oscillation frequency, Hz */
                frequencyHz: number;
                /** @description Period, s */
                periodS: number;
                /** @description Fraction of the period the output is high, between 50 % crossings */
                dutyCycle: number;
                /** @description Lowest capacitor voltage (its turning point), V */
                capacitorMinV: number;
                /** @description Highest capacitor voltage (its turning point), V */
                capacitorMaxV: number;
                /** @description Settled output high level, V */
                outputHighV: number;
                /** @description Settled output low level, V */
                outputLowV: number;
                /** @description Output 10–90 % rise time, s */
                riseTimeS: number;
                /** @description Output 90–10 % fall time, s */
                fallTimeS: number;
                /** @description Time constant of the charging capacitor, s */
                capacitorRisingTauS: number;
                /** @description Time constant of the discharging capacitor, s */
                capacitorFallingTauS: number;
                /** @description Share of the period the capacitor spends above the middle of its range */
                capacitorAboveMidShare: number;
                /** @description Switching level at node P while the output is high, V */
                upperThresholdV: number;
                /** @description Switching level at node P while the output is low, V */
                lowerThresholdV: number;
                /** @description (upper − lower threshold)/(output high − low) */
                hysteresisRatio: number;
            };
            /** @description What the forward model predicts with every parameter at its estimate */
            fitted: {
                /** @description Oscillation frequency, Hz */
                frequencyHz: number;
                /** @description Period, s */
                periodS: number;
                /** @description Fraction of the period the output is high, between 50 % crossings */
                dutyCycle: number;
                /** @description Lowest capacitor voltage (its turning point), V */
                capacitorMinV: number;
                /** @description Highest capacitor voltage (its turning point), V */
                capacitorMaxV: number;
                /** @description Settled output high level, V */
                outputHighV: number;
                /** @description Settled output low level, V */
                outputLowV: number;
                /** @description Output 10–90 % rise time, s */
                riseTimeS: number;
                /** @description Output 90–10 % fall time, s */
                fallTimeS: number;
                /** @description Time constant of the charging capacitor, s */
                capacitorRisingTauS: number;
                /** @description Time constant of the discharging capacitor, s */
                capacitorFallingTauS: number;
                /** @description Share of the period the capacitor spends above the middle of its range */
                capacitorAboveMidShare: number;
                /** @description Switching level at node P while the output is high, V */
                upperThresholdV: number;
                /** @description Switching level at node P while the output is low, V */
                lowerThresholdV: number;
                /** @description (upper − lower threshold)/(output high − low) */
                hysteresisRatio: number;
            };
            /** @description Every measurement the fit used, from `measurements` and the capture */
            measurements: {
                /** @description The measured figure (a key of `measurements`) */
                name: "frequencyHz" | "dutyCycle" | "capacitorMinV" | "capacitorMaxV" | "outputHighV" | "outputLowV" | "riseTimeS" | "fallTimeS" | "capacitorRisingTauS" | "capacitorFallingTauS" | "capacitorAboveMidShare";
                /** @description The measured value, in the unit the name states */
                value: number;
                /** @description Standard uncertainty used, same unit */
                uncertainty: number;
                /** @description scalar: from `measurements`; capture: read off the capture */
                source: "scalar" | "capture";
                /** @description What the nominal circuit predicts */
                nominal: number;
                /** @description What the fitted circuit predicts */
                fitted: number;
                /** @description (nominal − measured)/uncertainty */
                nominalResidual: number;
                /** @description (fitted − measured)/uncertainty */
                fittedResidual: number;
            }[];
            /** @description What the capture analysis (IEEE Std 181 levels, crossings, segment fits) found */
            capture?: {
                /** @description Figures read off the capture (absent ones: the channel they need was not given) */
                features: {
                    /** @description The channel the period, duty cycle and edges were read from (output when it is there) */
                    timingSource: "output" | "capacitor";
                    /** @description 1 / periodS, Hz */
                    frequencyHz: number;
                    /** @description Mean of the whole periods in the record, s */
                    periodS: number;
                    /** @description Standard deviation of the periods, s */
                    periodJitterS: number;
                    /** @description Shortest whole period in the record, s */
                    periodMinS: number;
                    /** @description Longest whole period in the record, s */
                    periodMaxS: number;
                    /** @description Whole periods in the record */
                    periodCount: number;
                    /** @description Output-high share of the period between 50 % crossings (output channel only) */
                    dutyCycle?: number;
                    /** @description Settled output level (IEEE Std 181 histogram levels refined over the settled parts of the states), V */
                    outputHighV?: number;
                    /** @description Settled output low level, read like outputHighV, V (output channel only) */
                    outputLowV?: number;
                    /** @description Mean 10–90 % transition duration, s */
                    riseTimeS?: number;
                    /** @description Mean 90–10 % transition duration of the falling edges, s (output channel only) */
                    fallTimeS?: number;
                    /** @description Output transitions (or capacitor turning points when timing comes from the capacitor) found */
                    edgeCount?: number;
                    /** @description Capacitor low turning points (local fits on both sides), averaged, V (capacitor channel only) */
                    capacitorMinV?: number;
                    /** @description Capacitor high turning points, averaged, V (capacitor channel only) */
                    capacitorMaxV?: number;
                    /** @description Windowed time constant of the charging segments, s */
                    risingTauS?: number;
                    /** @description Windowed time constant of the discharging segments, s */
                    fallingTauS?: number;
                    /** @description Share of the period the capacitor spends above the middle of its range */
                    capacitorAboveMidShare?: number;
                    /** @description Capacitor turning points found (capacitor channel only) */
                    turningPointCount?: number;
                    /** @description Samples in the record */
                    sampleCount: number;
                    /** @description Mean sample spacing, s */
                    sampleIntervalS: number;
                    /** @description Length of the record, s */
                    durationS: number;
                };
                /** @description How the capture was read (which column is which channel, and why) */
                notes: string[];
                /** @description What may make the readings less trustworthy (clipping, few periods, noise) */
                warnings: string[];
            };
            /** @description MAP estimates of every effective parameter, with priors from the nominal values and tolerances */
            estimates: components["schemas"]["ParameterEstimate"][];
            /** @description Derived, identifiable: (upper − lower threshold)/(output swing) */
            hysteresisRatio: {
                /** @description Hysteresis ratio of the nominal circuit */
                nominal: number;
                /** @description Hysteresis ratio at the estimate */
                estimate: number;
                /** @description Posterior standard deviation of the ratio, first order */
                standardDeviation: number;
            };
            /** @description Pairs the data cannot tell apart: whatever one does across its tolerance band, the other mimics to within the measurement uncertainty */
            indistinguishable: {
                /** @description The two parameters, as named in `estimates` */
                parameters: string[];
                /** @description Posterior correlation */
                correlation: number;
                /** @description Cosine between the data sensitivities of the two: ±1 = the measurements respond to both alike */
                sensitivityAlignment: number;
                /** @description What the measurements could see of the difference between the two across a tolerance band, in σ (< 1: nothing) */
                distinguishingSigma: number;
                /** @description What this means for the diagnosis, in words */
                note: string;
            }[];
            /** @description Parameters the data add (almost) nothing to: posterior width over 0.9 of the prior */
            uninformed: string[];
            /** @description Posterior correlation matrix */
            correlation: {
                /** @description Row and column order of the matrix, as named in `estimates` */
                parameters: string[];
                /** @description Correlation coefficients, −1..1, one row per parameter; the diagonal is 1 */
                matrix: number[][];
            };
            /** @description How the MAP fit went */
            fit: {
                /** @description Data χ² at the estimate */
                chiSquare: number;
                /** @description Prior penalty at the estimate: Σ((estimate − nominal)/prior σ)², in the parameters' fit spaces */
                priorChiSquare: number;
                /** @description Measurements fitted */
                measurementCount: number;
                /** @description Levenberg–Marquardt iterations taken */
                iterations: number;
                /** @description false: the fit stopped without meeting its convergence test (a warning says so); treat the estimates with care */
                converged: boolean;
            };
            /** @description Does the board behave as designed? */
            verdict: {
                /** @description true: the nominal circuit, its parts within tolerance, explains the measurements best and passes the χ² test */
                agreesWithNominal: boolean;
                /** @description χ² with every part at its nominal value */
                nominalChiSquare: number;
                /** @description χ² allowing every effect its tolerance or class spread (what the verdict tests) */
                toleranceChiSquare: number;
                /** @description Measurements the χ² figures count */
                measurementCount: number;
                /** @description 95 % χ² bound (Wilson–Hilferty) */
                chiSquareBound95: number;
                /** @description Posterior probability that nothing is off */
                nominalScore: number;
                /** @description The verdict in words with its figures, naming the most plausible explanation when the board departs from nominal */
                statement: string;
            };
            /** @description Ranked one- and two-cause explanations, wrong parts included */
            explanations: components["schemas"]["FitExplanation"][];
            /** @description Leading hypotheses the measurements cannot tell apart, and the measurement that would (computed from their predictions) */
            ambiguities: {
                /** @description Hypothesis ids the measurements cannot tell apart, the leading one first */
                hypotheses: string[];
                /** @description Largest difference of their predictions on the measured figures, in σ */
                measuredSeparationSigma: number;
                /** @description The ambiguity and what would settle it, in words */
                statement: string;
                /** @description A measurement that would tell them apart (absent: none found) */
                separatingMeasurement?: {
                    /** @description What to do on the bench, in words */
                    action: string;
                    /** @description The figure that would separate them: an observable, a switching level, or the frequency after a part swap */
                    figure: string;
                    /** @description What each hypothesis predicts for the figure */
                    predictions: {
                        /** @description Hypothesis id */
                        hypothesis: string;
                        /** @description What that hypothesis predicts for the figure, in its unit */
                        value: number;
                    }[];
                    /** @description Difference of the predictions over a typical bench uncertainty of that figure */
                    separationSigma: number;
                };
            }[];
            /** @description Hypotheses scored */
            candidateCount: number;
            /** @description What limits the answer (non-convergence, weak data, a model limit), in words */
            warnings: string[];
        };
        /** @description Where a role takes its values from: a series, or an approved-parts catalogue */
        ValueSource: {
            /** @description IEC 60063 preferred-number series */
            series: "E3" | "E6" | "E12" | "E24" | "E48" | "E96" | "E192";
            /** @description Part tolerance as a fraction (default: the tolerance usual for the series) */
            tolerance?: number;
        } | {
            /** @description Id of a stored catalogue; only parts not marked not-for-new-designs are used */
            catalogue: string;
        };
        /** @description Value source per kind of part, with per-role overrides */
        ValueSources: {
            /** @description Source for every resistor role without its own entry in `roles`. Absent: design uses E24 at 1 %; snap refuses a resistor role left with no source (400 at /values/resistor) */
            resistor?: components["schemas"]["ValueSource"];
            /** @description Source for every capacitor role without its own entry in `roles`. Absent: design uses E12 at 5 % (C0G); snap refuses a capacitor role left with no source (400 at /values/capacitor) */
            capacitor?: components["schemas"]["ValueSource"];
            /** @description Per-role sources, overriding the per-kind ones (e.g. rTiming from a catalogue) */
            roles?: {
                [key: string]: components["schemas"]["ValueSource"];
            };
        };
        /** @description One physical part: its value and where it comes from */
        PartReference: {
            /** @description Ohm or farad */
            value: number;
            /** @description Part tolerance, fraction */
            tolerance: number;
            /** @description Series the value belongs to */
            series?: string;
            /** @description Catalogue part number */
            partNumber?: string;
            /** @description Catalogue id */
            catalogue?: string;
            /** @description Capacitors: the dielectric the part has (catalogue) or was assumed to have (series), e.g. C0G */
            dielectric?: string;
        };
        /** @description A role filled by one part (its reference inline) or by two parts in series or parallel (listed in `parts`) */
        FittedPart: {
            /** @description The role this part fills, a key of the circuit's `parts` */
            role: string;
            /** @description Effective value of the role, ohm or farad */
            value: number;
            /** @description single: one part fills the role; series or parallel: two parts (listed in `parts`) combine to `value` */
            arrangement: "single" | "series" | "parallel";
            /** @description Part tolerance, fraction */
            tolerance?: number;
            /** @description Series the value belongs to */
            series?: string;
            /** @description Catalogue part number */
            partNumber?: string;
            /** @description Catalogue id */
            catalogue?: string;
            /** @description Capacitors: the dielectric the part has (catalogue) or was assumed to have (series), e.g. C0G */
            dielectric?: string;
            /** @description The two parts of a series or parallel combination */
            parts?: components["schemas"]["PartReference"][];
        };
        /** @description A value available from the source, and how far it is from the ideal */
        SnapChoice: {
            /** @description Effective value of the role, ohm or farad */
            value: number;
            /** @description single: one part fills the role; series or parallel: two parts (listed in `parts`) combine to `value` */
            arrangement: "single" | "series" | "parallel";
            /** @description Part tolerance, fraction */
            tolerance?: number;
            /** @description Series the value belongs to */
            series?: string;
            /** @description Catalogue part number */
            partNumber?: string;
            /** @description Catalogue id */
            catalogue?: string;
            /** @description Capacitors: the dielectric the part has (catalogue) or was assumed to have (series), e.g. C0G */
            dielectric?: string;
            /** @description The two parts of a series or parallel combination */
            parts?: components["schemas"]["PartReference"][];
            /** @description (value − ideal) / ideal */
            error: number;
        };
        /** @description Figures from the full analysis of the fitted circuit (as POST /v1/analyze reports them) */
        Prediction: {
            /** @description Predicted steady-state frequency, Hz */
            frequencyHz: number;
            /** @description Predicted fraction of the period the output is high */
            dutyCycle: number;
            /** @description Which model predicted it: time-domain when slew, delay, limits or clamps of the amplifier matter, else its closed-form special case */
            model: "closed-form" | "time-domain";
            /** @description Predicted switching thresholds */
            thresholds: {
                /** @description Capacitor voltage at which a high output switches low, V */
                upperV: number;
                /** @description Capacitor voltage at which a low output switches high, V */
                lowerV: number;
            };
            /** @description Mean supply current including the amplifier, A */
            supplyCurrentA: number;
        };
        /** @description Give `values`, `circuit` or both */
        SnapRequest: {
            /** @description Ideal values to snap one by one */
            values?: {
                /** @description The value wanted: ohms or farads as a number, or a value string ("15k8") */
                ideal: components["schemas"]["ComponentValue"];
                /** @description What the value is for: picks the unit and, in a catalogue, the parts of that kind */
                kind: "resistor" | "capacitor";
                /** @description Where the snapped value may come from */
                source: components["schemas"]["ValueSource"];
                /**
                 * @description Also look for the best two-part series or parallel combination
                 * @default false
                 */
                combinations?: boolean;
                /** @description Echoed back (e.g. a reference designator) */
                label?: string;
            }[];
            /** @description Size a whole circuit jointly: timing parts and threshold network from the value sources, for a target frequency */
            circuit?: {
                /** @description Deprecated aliases, accepted for one release (answers use the current id): single-supply-divider → three-resistor-divider, split-supply → two-resistor-feedback. */
                topology: "three-resistor-divider" | "two-resistor-feedback" | "single-supply-divider" | "split-supply";
                /** @description The rails the circuit runs from */
                supply: components["schemas"]["Supply"];
                /** @description The amplifier the candidates are analysed with (default: ideal) */
                amplifier?: components["schemas"]["AmplifierSpec"];
                /** @description Target oscillation frequency, Hz (0.001 to 100000000 Hz) */
                targetFrequencyHz: number;
                /** @description Wanted fraction of the period high, strictly between 0 and 1; absent: networks are placed for 0.5 and the duty cycle is not screened (dutyCycleError null) */
                targetDutyCycle?: number;
                /** @description Absolute duty-cycle tolerance when targetDutyCycle is given (default 0.02) */
                dutyTolerance?: number;
                /** @description Where each role takes its values from: series or catalogue, per kind or per role */
                values: components["schemas"]["ValueSources"];
                /** @description Value ranges searched (default 100 Ω to 10 MΩ, 100 pF to 10 µF) */
                ranges?: {
                    /** @description Smallest resistor value searched, ohm (0.001 to 1000000000000 Ω) */
                    rMinOhm?: number;
                    /** @description Largest resistor value searched, ohm (0.001 to 1000000000000 Ω) */
                    rMaxOhm?: number;
                    /** @description Smallest capacitor value searched, F (1e-15 to 10 F) */
                    cMinF?: number;
                    /** @description Largest capacitor value searched, F (1e-15 to 10 F) */
                    cMaxF?: number;
                };
                /** @description Allowed dielectric codes for catalogue capacitors */
                dielectrics?: string[];
                /** @description How the threshold network is chosen: near given ideal values, or freely within a hysteresis window */
                hysteresis?: {
                    /** @description Ideal threshold-network values to snap near (rTop, rBottom, rFeedback or rFeedback, rGround); without them the network is free */
                    ideal?: {
                        [key: string]: components["schemas"]["ComponentValue"];
                    };
                    /** @description Split supply, free network: lowest β = rGround/(rGround+rFeedback) (default 0.1) */
                    feedbackFractionMin?: number;
                    /** @description Split supply, free network: highest β (default 0.9) */
                    feedbackFractionMax?: number;
                    /** @description Single-supply divider, free network: hysteresis as a fraction of the swing (default 1/3) */
                    hysteresisFraction?: number;
                };
                /** @description Role that may be a two-part series or parallel combination */
                combine?: "rTiming" | "cTiming";
                /**
                 * @description How many candidates to return, best first (1 to 50)
                 * @default 5
                 */
                count?: number;
            };
        };
        /** @description Snapped values and jointly snapped circuits */
        SnapResponse: {
            /** @description One result per requested value, in request order (empty without `values`) */
            values: {
                /** @description The request's label, echoed (absent when none was given) */
                label?: string;
                /** @description The ideal value as the service read it, ohm or farad */
                ideal: number;
                /** @description resistor or capacitor, as requested */
                kind: string;
                /** @description The single value with the smallest relative error |value − ideal| / ideal (lower or higher) */
                nearest: components["schemas"]["SnapChoice"];
                /** @description Largest value <= ideal (null: none in the source) */
                lower: components["schemas"]["SnapChoice"] | null;
                /** @description Smallest value >= ideal (null: none in the source) */
                higher: components["schemas"]["SnapChoice"] | null;
                /** @description Best two-part combination when it beats the nearest single part */
                combination?: components["schemas"]["SnapChoice"] | null;
            }[];
            /** @description Present when the request had `circuit` */
            circuit?: {
                /** @description Best first by |frequencyError| */
                candidates: {
                    /** @description Topology id of the candidate */
                    topology: string;
                    /** @description Every role of the topology with the part(s) filling it */
                    parts: components["schemas"]["FittedPart"][];
                    /** @description What the full analysis of this candidate predicts */
                    predicted: components["schemas"]["Prediction"];
                    /** @description (predicted − target) / target */
                    frequencyError: number;
                    /** @description predicted − target duty cycle (null: no duty target) */
                    dutyCycleError: number | null;
                    /** @description Design checks on the candidate circuit, as POST /v1/analyze reports them */
                    checks: components["schemas"]["Check"][];
                }[];
                /** @description How much work the search did, for judging a slow request */
                search: {
                    /** @description Threshold networks built from the sources, before merging equal ratios */
                    thresholdNetworks: number;
                    /** @description Distinct threshold networks searched, after merging equal ratios and the duty screen */
                    distinctThresholdNetworks: number;
                    /** @description Timing-resistor values available in the ranges */
                    resistorValues: number;
                    /** @description Timing-capacitor values available in the ranges */
                    capacitorValues: number;
                    /** @description Candidate evaluations of the screening search */
                    pairsExamined: number;
                    /** @description Tuples an exhaustive search would evaluate */
                    exhaustiveTuples: number;
                    /** @description Short-listed candidates re-evaluated with the closed form */
                    closedFormEvaluations: number;
                    /** @description Candidates analysed in full (the model POST /v1/analyze uses) */
                    fullAnalyses: number;
                };
            };
        };
        /** @description Values default to E24 resistors at 1 % and E12 capacitors at 5 % (C0G) when `values` is omitted. `diode` models the steering diodes of diode-steered designs (default 0.6 V forward drop, 10 Ω); each such design's `circuit` carries the model it was analysed with. */
        DesignRequest: {
            /** @description Target frequency, Hz */
            targetFrequencyHz: number;
            /**
             * @description Fraction of the period the output is high; 0.1..0.9 by threshold placement, beyond that by diode steering
             * @default 0.5
             */
            targetDutyCycle?: number;
            /**
             * @description Absolute duty-cycle tolerance the built board must meet
             * @default 0.02
             */
            dutyTolerance?: number;
            /**
             * @description Frequency tolerance the built board must meet, fraction: the nominal design lies inside it and the yield counts boards inside it
             * @default 0.05
             */
            frequencyTolerance?: number;
            /** @description The rails the design runs from; a negative rail below 0 V also offers the split-supply networks */
            supply: components["schemas"]["Supply"];
            /** @description The amplifier every design is sized and analysed with */
            amplifier: components["schemas"]["AmplifierSpec"];
            /** @description Where each role takes its values from; a kind not given takes E24 resistors at 1 % or E12 C0G capacitors at 5 % */
            values?: components["schemas"]["ValueSources"];
            /** @description Windows and budgets every offered design keeps to (absent: the defaults of each field) */
            constraints?: {
                /**
                 * @description Resistor window, lower end, ohm
                 * @default 1000
                 */
                rMinOhm?: number;
                /**
                 * @description Resistor window, upper end, ohm
                 * @default 1000000
                 */
                rMaxOhm?: number;
                /**
                 * @description Timing-capacitor window, lower end, F (raised to 50× nodeCapacitanceF when that is higher)
                 * @default 1e-10
                 */
                cMinF?: number;
                /**
                 * @description Timing-capacitor window, upper end, F
                 * @default 0.00001
                 */
                cMaxF?: number;
                /**
                 * @description Stray plus input capacitance at the inverting input, F; the timing capacitor is kept at least 50× above it
                 * @default 5e-12
                 */
                nodeCapacitanceF?: number;
                /**
                 * @description Offer class II/III ceramic timing capacitors (then a warning; otherwise refused, as in analyze and BOM checks). Even then a class I, film or mica part of the same value is preferred, and a class II/III part is kept only when its DC-bias loss over the capacitor swing and its ageing over 10 years (class-typical figures for its dielectric, rating and case) leave the frequency inside frequencyTolerance. Electrolytics are never offered.
                 * @default false
                 */
                allowHighKDielectric?: boolean;
                /** @description Allowed dielectric codes for catalogue timing capacitors */
                dielectrics?: string[];
                /** @description Mean supply current budget including the amplifier, A (absent: no budget) */
                maxSupplyCurrentA?: number;
            };
            /** @description Default: the threshold-placement topologies that suit the supply for duty cycles of 0.1..0.9, diode-steered outside that range. Name diode-steered to have it offered inside the range too. Deprecated aliases, accepted for one release (answers use the current id): single-supply-divider → three-resistor-divider, split-supply → two-resistor-feedback. */
            topologies?: ("three-resistor-divider" | "two-resistor-feedback" | "diode-steered" | "single-supply-divider" | "split-supply")[];
            /** @description Steering-diode model for diode-steered designs (absent: 0.6 V drop, 10 Ω) */
            diode?: components["schemas"]["Diode"];
            /**
             * @description How many ranked designs to return at most (1 to 20)
             * @default 5
             */
            count?: number;
            /** @description Each design's worst case and Monte Carlo yield against frequencyTolerance and dutyTolerance, over the parts' tolerances (from their series or catalogue), their temperature behaviour over the range and the supply tolerance. */
            robustness?: {
                /** @description Board temperature range, °C (default 0 to 70) */
                temperature?: {
                    /** @description Lowest board temperature, °C (−60 to 200) */
                    minC: number;
                    /** @description Highest board temperature, °C (−60 to 200, at least minC) */
                    maxC: number;
                };
                /**
                 * @description Both rails within ± this fraction
                 * @default 0.05
                 */
                supplyTolerance?: number;
                /**
                 * @description Tempco of resistors whose source states none (metal film, common practice), ppm/K
                 * @default 100
                 */
                resistorTempcoPpmPerK?: number;
                /**
                 * @description Dielectric assumed for series capacitors (catalogue parts carry their own)
                 * @default C0G
                 */
                capacitorDielectric?: string;
                /**
                 * @description Monte Carlo samples per design (normal, tolerance = 3σ)
                 * @default 1000
                 */
                samples?: number;
                /**
                 * @description Monte Carlo seed, a 32-bit integer: the same seed and request give the same yields
                 * @default 1
                 */
                seed?: number;
                /** @description Offer only designs whose yield reaches this fraction (422 when none does) */
                minYield?: number;
            };
        };
        /** @description Ranked designs for the target */
        DesignResponse: {
            /** @description Ranked by yield (whole percent), then the margin left at the worst corner, then practicality, best first */
            designs: {
                /** @description Position in the ranking, 1 = best */
                rank: number;
                /** @description Topology id of this design */
                topology: string;
                /** @description Every role of the topology with the part(s) filling it */
                parts: components["schemas"]["FittedPart"][];
                /** @description What the full analysis of the built design predicts at nominal values */
                predicted: components["schemas"]["Prediction"];
                /** @description (predicted − target) / target, from the full analysis */
                frequencyError: number;
                /** @description predicted − target duty cycle */
                dutyCycleError: number;
                /** @description Hysteresis the design was built around, as a fraction of the output swing */
                hysteresisFraction: number;
                /** @description How the built boards spread: worst case and Monte Carlo yield against the requested tolerances */
                robustness: {
                    /** @description Fraction of Monte Carlo boards inside both tolerances */
                    yield: number;
                    /** @description Binomial standard error of yield, √(y(1 − y)/samples) */
                    yieldStandardError: number;
                    /** @description Wilson score interval of the yield */
                    yieldInterval95: {
                        /** @description Lower end of the 95 % interval, fraction */
                        low: number;
                        /** @description Upper end of the 95 % interval, fraction */
                        high: number;
                    };
                    /** @description Monte Carlo boards drawn for this design */
                    samples: number;
                    /** @description Seed used (repeat the request with it to reproduce the figures) */
                    seed: number;
                    /** @description Extremes over the corners of every part tolerance, the temperature range and the supply tolerance */
                    worstCase: {
                        /** @description Lowest frequency over the tolerance, temperature and supply corners, Hz */
                        frequencyMinHz: number;
                        /** @description Highest frequency over the corners, Hz */
                        frequencyMaxHz: number;
                        /** @description Lowest duty cycle over the corners */
                        dutyMin: number;
                        /** @description Highest duty cycle over the corners */
                        dutyMax: number;
                        /** @description Every corner inside frequencyTolerance and dutyTolerance */
                        withinSpec: boolean;
                    };
                    /** @description Share of the tolerance left at the worst corner (smaller of frequency and duty); negative when a corner leaves the spec */
                    marginFraction: number;
                    /** @description Tolerance each role was given, fraction */
                    partTolerances: {
                        [key: string]: number;
                    };
                    /** @description Which model evaluated the corners and samples */
                    model: "closed-form" | "time-domain";
                };
                /** @description How easy the design is to build; used to rank designs of equal yield and margin */
                practicality: {
                    /** @description 0 when every value sits in the geometric middle of its window, 1 at an edge */
                    edgeProximity: number;
                    /** @description Mean supply current including the amplifier, A */
                    supplyCurrentA: number;
                    /** @description Parts on the board besides the amplifier: a series or parallel pair counts two, steering diodes count */
                    partCount: number;
                    /** @description Smaller is more practical (edge proximity, part count, supply current, and a class II/III timing capacitor counting as much as a value at the edge of its window; our weighting) */
                    score: number;
                };
                /** @description What bounds each role: the window, output drive, bias-current error, supply budget or stray capacitance */
                limits: {
                    /** @description The role this window applies to */
                    role: string;
                    /** @description Smallest value the role may take, ohm or farad */
                    min: number;
                    /** @description Largest value the role may take, ohm or farad */
                    max: number;
                    /** @description What sets min, in words with the figures */
                    minReason: string;
                    /** @description What sets max, in words with the figures */
                    maxReason: string;
                    /** @description The end of the window the chosen value sits on (null: inside) */
                    atLimit: "min" | "max" | null;
                }[];
                /** @description The design as a circuit: send it to /v1/analyze, /v1/waveform or /v1/tolerance as it stands */
                circuit: components["schemas"]["Circuit"];
                /** @description Design checks on this design, as POST /v1/analyze reports them */
                checks: components["schemas"]["Check"][];
            }[];
            /** @description Topologies or hysteresis widths that gave nothing, and why */
            notes: string[];
        };
        /** @description A part's temperature behaviour */
        TemperatureCoefficient: {
            /** @description Linear temperature coefficient, ppm/K (value × (1 + α·(T − 25 °C))) */
            tempcoPpmPerK: number;
            /** @description Spread of the coefficient, ± ppm/K (uniform) */
            tempcoTolerancePpmPerK?: number;
        } | {
            /** @description Capacitor dielectric: an EIA-198 code (class I such as C0G or U2J: linear tempco ± its tolerance; class II/III such as X7R, X5R, Y5V: the code's change band, taken as uniform within the band at every temperature of the range) or a technology word (PP, PET, PPS, mica...) */
            dielectric: string;
        };
        /** @description A circuit and how its parts, temperature, supply and amplifier may spread */
        ToleranceRequest: {
            /** @description The nominal circuit, as a POST /v1/analyze body */
            circuit: components["schemas"]["Circuit"];
            /** @description Per-part tolerance by role, fraction. Parts not listed are exact, except a timing capacitor given as a part object with a tolerance (that tolerance is used). */
            tolerances: {
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rTiming?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                cTiming?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rTop?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rBottom?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rFeedback?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rGround?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rCharge?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rDischarge?: number;
                /** @description Tolerance of this part, fraction (0.01 = 1 %) */
                rPullup?: number;
            };
            /** @description Temperature behaviour by role. A timing capacitor given as a part object with a dielectric and not listed here follows its dielectric. */
            temperatureCoefficients?: {
                /** @description Temperature behaviour of rTiming over `temperature` (absent: its value does not change with temperature) */
                rTiming?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of cTiming over `temperature` (absent: its value does not change with temperature) */
                cTiming?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rTop over `temperature` (absent: its value does not change with temperature) */
                rTop?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rBottom over `temperature` (absent: its value does not change with temperature) */
                rBottom?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rFeedback over `temperature` (absent: its value does not change with temperature) */
                rFeedback?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rGround over `temperature` (absent: its value does not change with temperature) */
                rGround?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rCharge over `temperature` (absent: its value does not change with temperature) */
                rCharge?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rDischarge over `temperature` (absent: its value does not change with temperature) */
                rDischarge?: components["schemas"]["TemperatureCoefficient"];
                /** @description Temperature behaviour of rPullup over `temperature` (absent: its value does not change with temperature) */
                rPullup?: components["schemas"]["TemperatureCoefficient"];
            };
            /** @description Temperature range; Monte Carlo draws it uniformly, corners take its ends */
            temperature?: {
                /** @description Lowest board temperature, °C */
                minC: number;
                /** @description Highest board temperature, °C */
                maxC: number;
            };
            /** @description Years the board must keep its clock in spec (default 0: no ageing). A class II/III timing capacitor (dielectric from its part object, or from temperatureCoefficients) loses capacitance by the log-decade law C(t) = C(t0)·(1 − k·log10(t/t0)) from its ageHours to ageHours + years × 8766 h; corners take the start and the end of service, Monte Carlo a uniform age. */
            serviceLifeYears?: number;
            /** @description Supply spread, fraction: both rails scale by one shared draw unless supplyRailsIndependent */
            supplyTolerance?: number;
            /** @description Draw each rail on its own (default false: one regulator, rails move together) */
            supplyRailsIndependent?: boolean;
            /** @description Amplifier figure spreads. Slew rate and delay matter only when the time-domain model answers; spreads of a figure that is 0 or unlimited have no effect. */
            amplifierSpreads?: {
                /** @description Spread of outputHeadroomHighV, fraction of its nominal value */
                outputHeadroomHighV?: number;
                /** @description Spread of outputHeadroomLowV, fraction of its nominal value */
                outputHeadroomLowV?: number;
                /** @description Spread of outputResistanceOhm, fraction of its nominal value */
                outputResistanceOhm?: number;
                /** @description Spread of slewRateVPerS, fraction of its nominal value */
                slewRateVPerS?: number;
                /** @description Spread of recoveryDelayS, fraction of its nominal value */
                recoveryDelayS?: number;
                /** @description Spread of inputBiasCurrentA, fraction of its nominal value */
                inputBiasCurrentA?: number;
                /** @description Spread of inputOffsetV, fraction of its nominal value */
                inputOffsetV?: number;
                /** @description Input offset anywhere within nominal ± this, V */
                inputOffsetRangeV?: number;
            };
            /** @description Tracking groups: members share one random draw (their own tolerances then only set the default) */
            tracking?: {
                /** @description Parts that move together (one resistor network) */
                roles: ("rTiming" | "cTiming" | "rTop" | "rBottom" | "rFeedback" | "rGround" | "rCharge" | "rDischarge" | "rPullup")[];
                /** @description Spread of the shared draw (default: the largest tolerance of the members) */
                tolerance?: number;
                /** @description Independent spread of each member on top of the shared draw (default 0) */
                residualTolerance?: number;
            }[];
            /** @description Monte Carlo settings (default 10 000 samples, seed 1, normal) */
            monteCarlo?: {
                /** @description Samples (up to 1e6; 422 beyond). Also 422 limit-exceeded, before the bulk of the samples, when the time of the first samples projects the run past half the task deadline (slow circuits: a C(V) capacitor with strays costs ~2 ms an evaluation); figures.limit is the count that would fit */
                samples: number;
                /** @description Seed (default 1): the same seed gives the same result */
                seed?: number;
                /** @description Of tolerances, supply and amplifier spreads (default normal). Normal is truncated at ± the tolerance. */
                distribution?: "uniform" | "normal";
                /** @description Normal only: σ as a fraction of the tolerance (default 1/3, tolerance = 3σ, common practice) */
                sigmaPerTolerance?: number;
            };
            /** @description Spec the yield is counted against */
            spec?: {
                /** @description Target frequency, Hz (0.001 to 100000000 Hz) */
                frequencyHz: number;
                /** @description Allowed deviation from frequencyHz, fraction */
                frequencyTolerance: number;
                /** @description Lowest allowed duty cycle, fraction of the period high (absent: no lower duty limit) */
                dutyMin?: number;
                /** @description Highest allowed duty cycle, fraction of the period high (absent: no upper duty limit) */
                dutyMax?: number;
            };
            /** @description Bars of the SVG histogram (default 60) */
            histogramBins?: number;
        };
        /** @description Percentiles (Hyndman & Fan definition 7), mean, std, extremes */
        DistributionSummary: {
            /** @description 0.1th percentile, in the unit of the summarised figure (Hz, or a fraction for duty) */
            p0_1: number;
            /** @description 1st percentile */
            p1: number;
            /** @description 5th percentile */
            p5: number;
            /** @description Median */
            p50: number;
            /** @description 95th percentile */
            p95: number;
            /** @description 99th percentile */
            p99: number;
            /** @description 99.9th percentile */
            p99_9: number;
            /** @description Arithmetic mean of the oscillating samples */
            mean: number;
            /** @description Sample standard deviation (n − 1) */
            std: number;
            /** @description Smallest sample */
            min: number;
            /** @description Largest sample */
            max: number;
        };
        /** @description One corner of the variation box and what the circuit does there */
        ToleranceCorner: {
            /** @description Frequency at this corner, Hz */
            frequencyHz: number;
            /** @description Duty cycle at this corner, fraction of the period high */
            dutyCycle: number;
            /** @description Board temperature at this corner, °C (null: no temperature range given) */
            temperatureC: number | null;
            /** @description Value of every varied parameter at the corner, SI units */
            values: {
                [key: string]: number;
            };
            /** @description Relative change of each varied parameter against nominal */
            deviations: {
                [key: string]: number;
            };
        };
        /** @description Worst case, Monte Carlo, sensitivities and the variance budget of one circuit */
        ToleranceResult: {
            /** @description Topology id of the analysed circuit */
            topology: string;
            /** @description Which model evaluated every point */
            model: "closed-form" | "time-domain";
            /** @description Amplifier effects included in the model that produced this answer (empty: the closed-form special case) */
            modelEffects: ("slew-rate" | "recovery-delay" | "current-limit" | "input-clamp")[];
            /** @description The circuit with nothing varied */
            nominal: {
                /** @description Frequency with every part at its nominal value, 25 °C, Hz */
                frequencyHz: number;
                /** @description Duty cycle at nominal, fraction of the period high */
                dutyCycle: number;
            };
            /** @description Extremes over the corners of every tolerance, temperature, supply and amplifier spread */
            worstCase: {
                /** @description Lowest frequency found over the corners, Hz */
                frequencyMinHz: number;
                /** @description Highest frequency found over the corners, Hz */
                frequencyMaxHz: number;
                /** @description Lowest duty cycle found over the corners */
                dutyMin: number;
                /** @description Highest duty cycle found over the corners */
                dutyMax: number;
                /** @description all-corners: every corner of the box (up to 14 varied parameters with the closed form, 7 with the time-domain model); sensitivity-guided beyond that: corners chosen from one-at-a-time effects, then improved by ascent */
                method: "all-corners" | "sensitivity-guided";
                /** @description Circuits evaluated to find the extremes */
                cornersEvaluated: number;
                /** @description Corners at which the circuit does not oscillate (all-corners: every such corner; sensitivity-guided: those the search met, so more than 0 whenever it met one). The extremes are over the corners that oscillate */
                latchedCorners: number;
                /** @description The corner that produced each extreme */
                corners: {
                    /** @description The corner with the lowest frequency */
                    frequencyMin: components["schemas"]["ToleranceCorner"];
                    /** @description The corner with the highest frequency */
                    frequencyMax: components["schemas"]["ToleranceCorner"];
                    /** @description The corner with the lowest duty cycle */
                    dutyMin: components["schemas"]["ToleranceCorner"];
                    /** @description The corner with the highest duty cycle */
                    dutyMax: components["schemas"]["ToleranceCorner"];
                };
                /** @description Every corner meets the spec (null without a spec) */
                withinSpec: boolean | null;
            };
            /** @description Monte Carlo over every spread (settings from the request, or the defaults) */
            monteCarlo: {
                /** @description Samples drawn */
                samples: number;
                /** @description Seed used; the same seed and request give the same figures */
                seed: number;
                /** @description Distribution the spreads were drawn from */
                distribution: "uniform" | "normal";
                /** @description σ as a fraction of each tolerance (null: uniform distribution) */
                sigmaPerTolerance: number | null;
                /** @description Samples that oscillate */
                oscillating: number;
                /** @description Samples that do not oscillate (they count as failing the spec) */
                latched: number;
                /** @description Distribution of the frequency over the oscillating samples, Hz (null: none oscillates) */
                frequencyHz: components["schemas"]["DistributionSummary"] | null;
                /** @description Distribution of the duty cycle over the oscillating samples (null: none oscillates) */
                dutyCycle: components["schemas"]["DistributionSummary"] | null;
                /** @description Fraction of samples inside the spec (latched samples fail); null without a spec */
                yield: number | null;
                /** @description How the yield splits (null without a spec) */
                yieldDetail: {
                    /** @description Samples inside the spec */
                    passing: number;
                    /** @description Samples outside the spec, latched ones included */
                    failing: number;
                    /** @description Binomial standard error of the yield, √(y(1 − y)/samples) */
                    standardError: number;
                    /** @description Wilson score interval */
                    interval95: {
                        /** @description Lower end of the 95 % interval, fraction */
                        low: number;
                        /** @description Upper end of the 95 % interval, fraction */
                        high: number;
                    };
                    /** @description Fraction of samples inside the frequency tolerance alone */
                    frequencyPassFraction: number;
                    /** @description Fraction of samples inside the duty limits alone (1 without duty limits) */
                    dutyPassFraction: number;
                } | null;
                /** @description Wall time of the sampling, s (varies with the machine and its load) */
                elapsedS: number;
                /** @description samples / elapsedS */
                samplesPerSecond: number;
            };
            /** @description Ranked by |sensitivity| */
            sensitivities: {
                /** @description Part role, or the supply/amplifier/diode/stray parameter name (diodeForwardDropV: the steering diodes' forward drop) */
                role: string;
                /** @description What the parameter belongs to */
                kind: "resistor" | "capacitor" | "supply" | "amplifier" | "load" | "diode" | "stray";
                /** @description d ln f / d ln x at nominal */
                sensitivity: number;
                /** @description d(duty) / d ln x at nominal */
                dutySensitivity: number;
                /** @description Share of the first-order variance of ln f from this part's own variations */
                varianceShare: number;
            }[];
            /** @description First-order variance budget of ln f by independent source, largest first */
            varianceSources: {
                /** @description The role, tracking group or parameter the variation comes from */
                source: string;
                /** @description What kind of variation it is */
                kind: "part-tolerance" | "tracking" | "tracking-residual" | "temperature" | "tempco-spread" | "dielectric-band" | "supply" | "amplifier" | "ageing";
                /** @description First-order share of the variance of ln f, 0..1 */
                share: number;
                /** @description First-order contribution to the relative standard deviation of f, fraction */
                relativeStd: number;
            }[];
            /** @description First-order (linear) spread estimate, to compare with the Monte Carlo figures */
            linearEstimate: {
                /** @description Root sum of squares of the sources, fraction */
                frequencyRelativeStd: number;
            };
            /** @description How each part with a temperature behaviour was modelled */
            temperatureModels: {
                /** @description The part role */
                role: string;
                /** @description tempco: a linear coefficient; dielectric: the change band of an EIA-198 code or technology */
                model: "tempco" | "dielectric";
                /** @description The dielectric code or technology (null for a tempco) */
                dielectric: string | null;
                /** @description Lowest relative change of the value over the temperature range and its spread, fraction (negative: the value falls) */
                changeMinFraction: number;
                /** @description Highest relative change of the value over the temperature range and its spread, fraction */
                changeMaxFraction: number;
                /** @description false: the temperature range leaves the dielectric's rated range (a note says so) */
                withinRatedRange: boolean;
            }[];
            /** @description Active parts that follow the board temperature at every corner and Monte Carlo sample (with a temperature range): amplifier offset, bias current, headroom and delay drift, the steering diodes' forward drop */
            temperatureDrifts: {
                /** @description The drifting parameter (inputOffsetV, inputBiasCurrentA, outputHeadroomHighV/LowV, recoveryDelayS, diodeForwardDropV); the values below are in the unit its name states */
                parameter: string;
                /** @description amplifier: its drift figures (amplifier table); steering-diodes: the forward drop, −2 mV/K (common practice) */
                source: "amplifier" | "steering-diodes";
                /** @description The law with its figure, in words */
                law: string;
                /** @description Value at 25 °C */
                valueAtReference: number;
                /** @description Smallest value over the temperature range */
                valueMin: number;
                /** @description Largest value over the temperature range */
                valueMax: number;
            }[];
            /** @description The timing capacitor's ageing over serviceLifeYears (null: no service life, or a capacitor that does not age) */
            ageing: {
                /** @description The timing capacitor */
                role: string;
                /** @description Loss per decade of hours, fraction (typical of the class) */
                ratePerDecade: number;
                /** @description Hours since de-ageing at the start of service */
                ageStartHours: number;
                /** @description Hours since de-ageing at the end of service */
                ageEndHours: number;
                /** @description The service life the run covers */
                serviceLifeYears: number;
                /** @description Capacitance change over the service life, fraction (negative: loss) */
                changeFraction: number;
            } | null;
            /** @description Things the caller should know about how the request was read (no effect, latching, ranges left) */
            notes: {
                /** @description Stable code, e.g. corners-latch, samples-latch, nothing-varies, spread-without-effect, ageing-not-included */
                code: string;
                /** @description What the note means for this request, in words with the figures */
                message: string;
            }[];
        };
        /** @description A circuit and the time window to sample */
        WaveformRequest: {
            /** @description The circuit to simulate, as a POST /v1/analyze body */
            circuit: components["schemas"]["Circuit"];
            /**
             * @description Periods of the steady oscillation to cover
             * @default 3
             */
            periods?: number;
            /**
             * @description Samples on a uniform time grid, both ends included; more than 200000 is refused with 422
             * @default 2000
             */
            samples?: number;
            /**
             * @description Start at power-up with the capacitor empty instead of at a rising decision of the steady state
             * @default false
             */
            includePowerUp?: boolean;
        };
        /** @description Sampled node voltages of the simulated circuit; the arrays share one index */
        Waveform: {
            /**
             * @description Waveforms always come from the time-domain engine
             * @enum {string}
             */
            model: "time-domain";
            /** @description Steady-state frequency of the simulated circuit, Hz (as POST /v1/analyze reports it) */
            frequencyHz: number;
            /** @description Steady-state period, s */
            periodS: number;
            /** @description Fraction of the period the output is high, between 50 % crossings */
            dutyCycle: number;
            /** @description Switching thresholds, to draw beside capacitorV */
            thresholds: {
                /** @description Capacitor voltage at which a high output switches low, V */
                upperV: number;
                /** @description Capacitor voltage at which a low output switches high, V */
                lowerV: number;
            };
            /** @description Echo of the request: true when timeS starts at power-up with the capacitor empty */
            includePowerUp: boolean;
            /** @description Sample times from the window start (power-up, or a rising decision), s */
            timeS: number[];
            /** @description Timing-capacitor voltage (inverting input N), V */
            capacitorV: number[];
            /** @description Output pin voltage, V */
            outputV: number[];
            /** @description Threshold node (non-inverting input P), V */
            decisionV: number[];
        };
    };
    responses: never;
    parameters: never;
    requestBodies: never;
    headers: never;
    pathItems: never;
}
export type $defs = Record<string, never>;
export type operations = Record<string, never>;
