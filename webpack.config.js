/* Builds the add-in: one entry per surface (custom functions, task pane, commands); functions.json
 * and one help page per function generated from the function catalogue (src/registry); office.js
 * copied from @microsoft/office-js so the add-in loads only its own assets (no CDN). The origin of
 * the help links is the one manifest.xml serves functions.json from. */
'use strict';
const path = require('path');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const { addinOrigin, loadCatalogue } = require('./scripts/lib/catalogue');

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

// Office's own script files for Excel (other hosts and debug builds left out).
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
          use: { loader: 'ts-loader', options: { transpileOnly: true, compilerOptions: { noEmit: false, sourceMap: dev } } },
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
