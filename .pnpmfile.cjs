// better-sqlite3 compiles from source on these machines (its prebuilt download is unreachable);
// node-gyp must use the local Node.js headers instead of downloading them.
module.exports = {
  hooks: {
    updateConfig(config) {
      config.extraEnv = { ...(config.extraEnv ?? {}), npm_config_nodedir: process.env.npm_config_nodedir || "/usr" };
      return config;
    },
  },
};
