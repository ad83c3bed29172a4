/** The Dockerfile of a Node 20 slim image with Ripplewise installed, for the Kubernetes Job. */
import type { TemplateOptions } from './index';

export function dockerfileTemplate(o: TemplateOptions): string {
  return `# Ripplewise ${o.toolVersion} on Node 20 (Debian slim), for sweeps on Kubernetes or any container runner.
# Build it from the root of a Ripplewise checkout (with a .dockerignore that lists node_modules):
#   docker build -t ${o.image} -f Dockerfile .
# Every package comes from the npm registry through package-lock.json; nothing is downloaded
# at run time, and the command needs no build step (tsx runs the TypeScript).
FROM node:20-slim
ENV NODE_ENV=production
WORKDIR /opt/ripplewise
COPY package.json package-lock.json ./
RUN npm ci --omit=dev --ignore-scripts && npm cache clean --force
COPY bin ./bin
COPY engine ./engine
COPY src ./src
COPY tsconfig.json ./
RUN ln -s /opt/ripplewise/bin/ripplewise.mjs /usr/local/bin/ripplewise
USER node
WORKDIR /work
CMD ["ripplewise", "--help"]
`;
}
