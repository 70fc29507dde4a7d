// dt-sql-parser ships ES modules written for bundlers: imports without a
// file extension, directory imports, and no "type": "module". These
// module hooks let Node load it as it is: a relative import that does not
// resolve is tried with ".js" and "/index.js", and the package's files
// are loaded as ES modules (Node 18, Debian 12's, does not detect them).
export async function resolve(specifier, context, next) {
  try {
    return await next(specifier, context);
  } catch (err) {
    if (!specifier.startsWith('.')) {
      throw err;
    }
    for (const candidate of [specifier + '.js', specifier + '/index.js']) {
      try {
        return await next(candidate, context);
      } catch {
        // try the next spelling
      }
    }
    throw err;
  }
}

export async function load(url, context, next) {
  if (url.includes('/node_modules/dt-sql-parser/dist/') && url.endsWith('.js')) {
    return next(url, { ...context, format: 'module' });
  }
  return next(url, context);
}
