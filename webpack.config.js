/* Builds the add-in: one entry per surface (custom functions, task pane, commands); functions.json
 * and one help page per function generated from the function catalogue (src/registry); office.js
 * copied from @microsoft/office-js so the add-in loads only its own assets (no CDN). The origin of
 * the help links is the one manifest.xml serves functions.json from. */
'use strict';
const path = require('path');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const ts = require('typescript');
const { addinOrigin, loadCatalogue } = require('./scripts/lib/catalogue');

/** Where a parameter builder of src/registry/define.ts takes its help text. */
const TEXT_ARGUMENT = { num: 1, optNum: 2, optNumNone: 1, word: 2, optWord: 3, range: 1, optRange: 1 };

/**
 * The help text of every catalogue entry (its `doc`, and each parameter's text) reaches Excel
 * through functions.json and the help pages made below; the add-in's own scripts never read it.
 * This TypeScript transformer leaves it out of functions.js and taskpane.js (the command line
 * keeps it for `leeway help`).
 */
function withoutCatalogueDocs(context) {
  const f = ts.factory;
  return (file) => {
    if (!/[\\/]src[\\/]registry[\\/](catalogue[\\/]|params\.ts$)/.test(file.fileName)) return file;
    const visit = (node) => {
      if (ts.isPropertyAssignment(node) && ts.isIdentifier(node.name) && node.name.text === 'doc' && ts.isObjectLiteralExpression(node.initializer)) {
        return f.updatePropertyAssignment(node, node.name, f.createObjectLiteralExpression([]));
      }
      if (ts.isCallExpression(node) && ts.isIdentifier(node.expression) && node.expression.text in TEXT_ARGUMENT) {
        const at = TEXT_ARGUMENT[node.expression.text];
        if (node.arguments.length > at) {
          const args = node.arguments.map((a, i) => (i === at ? f.createStringLiteral('') : ts.visitNode(a, visit)));
          return f.updateCallExpression(node, node.expression, node.typeArguments, args);
        }
      }
      return ts.visitEachChild(node, visit, context);
    };
    return ts.visitNode(file, visit);
  };
}

/** Emits functions.json and help/*.html from the catalogue, read afresh on every build. */
class CatalogueAssetsPlugin {
  apply(compiler) {
    const { RawSource } = compiler.webpack.sources;
    compiler.hooks.thisCompilation.tap('CatalogueAssets', (compilation) => {
      compilation.hooks.processAssets.tap({ name: 'CatalogueAssets', stage: compiler.webpack.Compilation.PROCESS_ASSETS_STAGE_ADDITIONAL }, () => {
        const c = loadCatalogue();
        compilation.emitAsset('functions.json', new RawSource(JSON.stringify(c.functionsJson(addinOrigin()), null, 2) + '\n'));
        compilation.emitAsset('help/index.html', new RawSource(c.helpIndex()));
        compilation.emitAsset('help/help.css', new RawSource(c.HELP_CSS));
        for (const def of c.FUNCTIONS) compilation.emitAsset(c.helpPath(def), new RawSource(c.helpPage(def)));
      });
      compilation.fileDependencies.add(path.join(__dirname, 'src', 'registry'));
    });
  }
}

const OFFICE_SKIP = /^(access|onenote|outlook|outlookwebapp|powerpoint|project|visio|word)[-.]|\.debug\.js$|\.d\.ts$|vsdoc/;

module.exports = (env, argv) => {
  const dev = argv.mode !== 'production';
  return {
    mode: dev ? 'development' : 'production',
    devtool: dev ? 'source-map' : false,
    entry: {
      functions: './src/functions/index.ts',
      taskpane: './src/taskpane/index.ts',
      commands: './src/commands/commands.ts',
    },
    output: { path: path.join(__dirname, 'dist', 'addin'), filename: '[name].js', clean: true },
    resolve: { extensions: ['.ts', '.js'] },
    target: ['web', 'es2020'],
    module: {
      rules: [
        {
          test: /\.ts$/,
          exclude: /node_modules/,
          // ES modules into webpack (tsconfig's commonjs is for jest and tsc): scope hoisting and
          // tree shaking keep the task pane and functions bundles within their budgets.
          use: {
            loader: 'ts-loader',
            options: { transpileOnly: true, compilerOptions: { noEmit: false, sourceMap: dev, module: 'esnext' }, getCustomTransformers: () => ({ before: [withoutCatalogueDocs] }) },
          },
        },
        { test: /\.css$/, type: 'asset/resource', generator: { filename: 'assets/[name][ext]' } },
      ],
    },
    performance: { hints: false },
    plugins: [
      new CatalogueAssetsPlugin(),
      new HtmlWebpackPlugin({ filename: 'functions.html', template: './src/functions/functions.html', chunks: ['functions'] }),
      new HtmlWebpackPlugin({ filename: 'taskpane.html', template: './src/taskpane/taskpane.html', chunks: ['taskpane'] }),
      new HtmlWebpackPlugin({ filename: 'commands.html', template: './src/commands/commands.html', chunks: ['commands'] }),
      new CopyWebpackPlugin({
        patterns: [
          { from: 'assets/*.png', to: 'assets/[name][ext]' },
          { from: 'src/taskpane/taskpane.css', to: 'assets/taskpane.css' },
          {
            from: '**/*',
            context: 'node_modules/@microsoft/office-js/dist',
            to: 'assets/office-js/',
            info: { minimized: true },
            filter: (p) => !OFFICE_SKIP.test(path.relative(path.join(__dirname, 'node_modules/@microsoft/office-js/dist'), p)),
          },
        ],
      }),
    ],
  };
};
