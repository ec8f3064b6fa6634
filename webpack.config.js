/* Builds the add-in: one entry per surface (custom functions, task pane, commands), functions.json
 * generated from the JSDoc of src/functions/*.ts, and office.js copied from @microsoft/office-js
 * so the add-in loads only its own assets (no CDN). `ADDIN_ORIGIN` sets the served origin. */
'use strict';
const path = require('path');
const fs = require('fs');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');

const functionFiles = fs
  .readdirSync(path.join(__dirname, 'src', 'functions'))
  .filter((f) => f.endsWith('.ts') && f !== 'adapter.ts')
  .sort()
  .map((f) => `./src/functions/${f}`);

// Office's own script files for Excel (other hosts and debug builds left out).
const OFFICE_SKIP = /^(access|onenote|outlook|outlookwebapp|powerpoint|project|visio|word)[-.]|\.debug\.js$|\.d\.ts$|vsdoc/;

module.exports = (env, argv) => {
  const dev = argv.mode !== 'production';
  return {
    mode: dev ? 'development' : 'production',
    devtool: dev ? 'source-map' : false,
    entry: {
      functions: functionFiles,
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
      new CustomFunctionsMetadataPlugin({ output: 'functions.json', input: functionFiles }),
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
