# syntax=docker/dockerfile:1
# Multi-stage build: compile TypeScript and the better-sqlite3 addon in a build
# stage, ship only dist/ and production dependencies, run as the non-root user.

FROM node:20-bookworm-slim AS build
WORKDIR /app
# better-sqlite3 builds from source when no prebuilt binary can be fetched.
RUN apt-get update && apt-get install -y --no-install-recommends python3 make g++ && rm -rf /var/lib/apt/lists/*
COPY package.json package-lock.json ./
RUN npm ci
COPY tsconfig.json tsconfig.build.json ./
COPY src ./src
RUN npm run build && npm prune --omit=dev

FROM node:20-bookworm-slim AS runtime
ENV NODE_ENV=production \
    PORT=8080 \
    HOST=0.0.0.0 \
    TICKWRIGHT_DB_PATH=/data/tickwright.db
WORKDIR /app
COPY --from=build /app/package.json ./
COPY --from=build /app/node_modules ./node_modules
COPY --from=build /app/dist ./dist
RUN mkdir -p /data && chown node:node /data
USER node
VOLUME ["/data"]
EXPOSE 8080
HEALTHCHECK --interval=15s --timeout=3s --start-period=10s --retries=3 \
  CMD node -e "fetch('http://127.0.0.1:'+(process.env.PORT||8080)+'/healthz').then(r=>process.exit(r.ok?0:1)).catch(()=>process.exit(1))"
# Node is PID 1's child via the exec form: SIGTERM reaches the graceful shutdown handler.
CMD ["node", "dist/server.js"]
