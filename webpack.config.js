/**
 * Builds the Excel add-in into dist/ (or env.outputPath):
 *   functions.js    the custom functions (entry: the generated adapter src/functions/excel.generated.ts)
 *   functions.json  their metadata, read from the JSDoc of that file by custom-functions-metadata-plugin
 *   functions.html  the page that loads them in Excel on the web (Content-Security-Policy in the template)
 *   help.html/.css  the function reference, rendered from the function table at build time
 *   manifest.xml, assets/icon-*.png
 * `npm run build` = generate + `webpack --mode production`. Tests call this function with { outputPath }.
 */
'use strict';
const path = require('path');
const webpack = require('webpack');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');

const ADAPTER = path.join(__dirname, 'src', 'functions', 'excel.generated.ts');
/** Packages of the headless engine and CLI; the add-in bundle must never contain them. */
const FORBIDDEN = ['hyperformula', 'exceljs', 'mathjs'];

/**
 * The generated adapter associates every id itself (so it is complete without this build), while
 * custom-functions-metadata-plugin would append a second CustomFunctions.associate per function through its
 * loader. Drop that loader; the metadata still comes from the plugin.
 */
class KeepOwnAssociations {
  apply(compiler) {
    const pluginLoader = require.resolve('custom-functions-metadata-plugin/lib/loader.js');
    compiler.hooks.compilation.tap('KeepOwnAssociations', (compilation) => {
      webpack.NormalModule.getCompilationHooks(compilation).beforeLoaders.tap('KeepOwnAssociations', (loaders, module) => {
        for (let i = module.loaders.length - 1; i >= 0; i--) {
          if (module.loaders[i].loader === pluginLoader) module.loaders.splice(i, 1);
        }
      });
    });
  }
}

/** Fails the build if any engine-only package was pulled into the bundle. */
class ForbidPackages {
  apply(compiler) {
    compiler.hooks.afterCompile.tap('ForbidPackages', (compilation) => {
      for (const m of compilation.modules) {
        const resource = m.resource || '';
        const hit = FORBIDDEN.find((p) => resource.includes(`${path.sep}node_modules${path.sep}${p}${path.sep}`));
        if (hit) {
          compilation.errors.push(new webpack.WebpackError(`${hit} must not be bundled into the add-in (from ${resource}).`));
        }
      }
    });
  }
}

function helpPage() {
  // The help page is rendered from the TypeScript function table while webpack runs.
  require('ts-node').register({ transpileOnly: true, compilerOptions: { module: 'commonjs' } });
  const { FUNCTIONS } = require('./src/functions/table');
  const { renderHelpPage } = require('./src/functions/help-page');
  return renderHelpPage(FUNCTIONS);
}

module.exports = (env = {}, argv = {}) => {
  const mode = argv.mode || 'production';
  return {
    mode,
    context: __dirname,
    target: ['web', 'es2017'],
    entry: { functions: ADAPTER },
    output: {
      path: env.outputPath ? path.resolve(env.outputPath) : path.join(__dirname, 'dist'),
      filename: '[name].js',
      clean: true,
    },
    // Source maps for the script only, never eval-based ones: the functions page forbids eval.
    devtool: false,
    resolve: { extensions: ['.ts', '.js'] },
    module: {
      rules: [
        {
          test: /\.ts$/,
          exclude: /node_modules/,
          use: {
            loader: 'ts-loader',
            options: { transpileOnly: true, compilerOptions: { target: 'es2017', module: 'es2020', moduleResolution: 'node', sourceMap: true } },
          },
        },
      ],
    },
    plugins: [
      new webpack.SourceMapDevToolPlugin({ test: /\.js$/, filename: '[file].map' }),
      new CustomFunctionsMetadataPlugin({ input: ADAPTER, output: 'functions.json' }),
      new KeepOwnAssociations(),
      new ForbidPackages(),
      new HtmlWebpackPlugin({
        filename: 'functions.html',
        template: path.join(__dirname, 'src', 'functions', 'functions.html'),
        chunks: ['functions'],
        inject: 'head',
        scriptLoading: 'defer',
      }),
      new HtmlWebpackPlugin({ filename: 'help.html', templateContent: helpPage, inject: false, minify: false }),
      new CopyWebpackPlugin({
        patterns: [
          { from: 'manifest.xml' },
          { from: 'assets/icon-*.png' },
          { from: 'src/functions/help-page.css', to: 'help.css' },
        ],
      }),
    ],
    // Only the script is minified; the help page and its styles stay readable.
    optimization: { minimizeOptions: { html: false, css: false } },
    performance: { hints: false },
    stats: 'errors-warnings',
  };
};

module.exports.FORBIDDEN = FORBIDDEN;
