import { createRequire as __createRequire } from 'module'; const require = __createRequire(import.meta.url);
var __create = Object.create;
var __defProp = Object.defineProperty;
var __getOwnPropDesc = Object.getOwnPropertyDescriptor;
var __getOwnPropNames = Object.getOwnPropertyNames;
var __getProtoOf = Object.getPrototypeOf;
var __hasOwnProp = Object.prototype.hasOwnProperty;
var __require = /* @__PURE__ */ ((x) => typeof require !== "undefined" ? require : typeof Proxy !== "undefined" ? new Proxy(x, {
  get: (a, b) => (typeof require !== "undefined" ? require : a)[b]
}) : x)(function(x) {
  if (typeof require !== "undefined") return require.apply(this, arguments);
  throw Error('Dynamic require of "' + x + '" is not supported');
});
var __commonJS = (cb, mod) => function __require2() {
  try {
    return mod || (0, cb[__getOwnPropNames(cb)[0]])((mod = { exports: {} }).exports, mod), mod.exports;
  } catch (e) {
    throw mod = 0, e;
  }
};
var __copyProps = (to, from, except, desc) => {
  if (from && typeof from === "object" || typeof from === "function") {
    for (let key of __getOwnPropNames(from))
      if (!__hasOwnProp.call(to, key) && key !== except)
        __defProp(to, key, { get: () => from[key], enumerable: !(desc = __getOwnPropDesc(from, key)) || desc.enumerable });
  }
  return to;
};
var __toESM = (mod, isNodeMode, target) => (target = mod != null ? __create(__getProtoOf(mod)) : {}, __copyProps(
  // If the importer is in node compatibility mode or this is not an ESM
  // file that has been converted to a CommonJS file using a Babel-
  // compatible transform (i.e. "__esModule" has not been set), then set
  // "default" to the CommonJS "module.exports" for node compatibility.
  isNodeMode || !mod || !mod.__esModule ? __defProp(target, "default", { value: mod, enumerable: true }) : target,
  mod
));

// node_modules/yaml/dist/nodes/identity.js
var require_identity = __commonJS({
  "node_modules/yaml/dist/nodes/identity.js"(exports) {
    "use strict";
    var ALIAS = /* @__PURE__ */ Symbol.for("yaml.alias");
    var DOC = /* @__PURE__ */ Symbol.for("yaml.document");
    var MAP = /* @__PURE__ */ Symbol.for("yaml.map");
    var PAIR = /* @__PURE__ */ Symbol.for("yaml.pair");
    var SCALAR = /* @__PURE__ */ Symbol.for("yaml.scalar");
    var SEQ = /* @__PURE__ */ Symbol.for("yaml.seq");
    var NODE_TYPE = /* @__PURE__ */ Symbol.for("yaml.node.type");
    var isAlias4 = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === ALIAS;
    var isDocument = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === DOC;
    var isMap4 = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === MAP;
    var isPair = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === PAIR;
    var isScalar6 = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === SCALAR;
    var isSeq4 = (node) => !!node && typeof node === "object" && node[NODE_TYPE] === SEQ;
    function isCollection2(node) {
      if (node && typeof node === "object")
        switch (node[NODE_TYPE]) {
          case MAP:
          case SEQ:
            return true;
        }
      return false;
    }
    function isNode(node) {
      if (node && typeof node === "object")
        switch (node[NODE_TYPE]) {
          case ALIAS:
          case MAP:
          case SCALAR:
          case SEQ:
            return true;
        }
      return false;
    }
    var hasAnchor = (node) => (isScalar6(node) || isCollection2(node)) && !!node.anchor;
    exports.ALIAS = ALIAS;
    exports.DOC = DOC;
    exports.MAP = MAP;
    exports.NODE_TYPE = NODE_TYPE;
    exports.PAIR = PAIR;
    exports.SCALAR = SCALAR;
    exports.SEQ = SEQ;
    exports.hasAnchor = hasAnchor;
    exports.isAlias = isAlias4;
    exports.isCollection = isCollection2;
    exports.isDocument = isDocument;
    exports.isMap = isMap4;
    exports.isNode = isNode;
    exports.isPair = isPair;
    exports.isScalar = isScalar6;
    exports.isSeq = isSeq4;
  }
});

// node_modules/yaml/dist/visit.js
var require_visit = __commonJS({
  "node_modules/yaml/dist/visit.js"(exports) {
    "use strict";
    var identity = require_identity();
    var BREAK = /* @__PURE__ */ Symbol("break visit");
    var SKIP = /* @__PURE__ */ Symbol("skip children");
    var REMOVE = /* @__PURE__ */ Symbol("remove node");
    function visit3(node, visitor) {
      const visitor_ = initVisitor(visitor);
      if (identity.isDocument(node)) {
        const cd = visit_(null, node.contents, visitor_, Object.freeze([node]));
        if (cd === REMOVE)
          node.contents = null;
      } else
        visit_(null, node, visitor_, Object.freeze([]));
    }
    visit3.BREAK = BREAK;
    visit3.SKIP = SKIP;
    visit3.REMOVE = REMOVE;
    function visit_(key, node, visitor, path) {
      const ctrl = callVisitor(key, node, visitor, path);
      if (identity.isNode(ctrl) || identity.isPair(ctrl)) {
        replaceNode(key, path, ctrl);
        return visit_(key, ctrl, visitor, path);
      }
      if (typeof ctrl !== "symbol") {
        if (identity.isCollection(node)) {
          path = Object.freeze(path.concat(node));
          for (let i = 0; i < node.items.length; ++i) {
            const ci = visit_(i, node.items[i], visitor, path);
            if (typeof ci === "number")
              i = ci - 1;
            else if (ci === BREAK)
              return BREAK;
            else if (ci === REMOVE) {
              node.items.splice(i, 1);
              i -= 1;
            }
          }
        } else if (identity.isPair(node)) {
          path = Object.freeze(path.concat(node));
          const ck = visit_("key", node.key, visitor, path);
          if (ck === BREAK)
            return BREAK;
          else if (ck === REMOVE)
            node.key = null;
          const cv = visit_("value", node.value, visitor, path);
          if (cv === BREAK)
            return BREAK;
          else if (cv === REMOVE)
            node.value = null;
        }
      }
      return ctrl;
    }
    async function visitAsync(node, visitor) {
      const visitor_ = initVisitor(visitor);
      if (identity.isDocument(node)) {
        const cd = await visitAsync_(null, node.contents, visitor_, Object.freeze([node]));
        if (cd === REMOVE)
          node.contents = null;
      } else
        await visitAsync_(null, node, visitor_, Object.freeze([]));
    }
    visitAsync.BREAK = BREAK;
    visitAsync.SKIP = SKIP;
    visitAsync.REMOVE = REMOVE;
    async function visitAsync_(key, node, visitor, path) {
      const ctrl = await callVisitor(key, node, visitor, path);
      if (identity.isNode(ctrl) || identity.isPair(ctrl)) {
        replaceNode(key, path, ctrl);
        return visitAsync_(key, ctrl, visitor, path);
      }
      if (typeof ctrl !== "symbol") {
        if (identity.isCollection(node)) {
          path = Object.freeze(path.concat(node));
          for (let i = 0; i < node.items.length; ++i) {
            const ci = await visitAsync_(i, node.items[i], visitor, path);
            if (typeof ci === "number")
              i = ci - 1;
            else if (ci === BREAK)
              return BREAK;
            else if (ci === REMOVE) {
              node.items.splice(i, 1);
              i -= 1;
            }
          }
        } else if (identity.isPair(node)) {
          path = Object.freeze(path.concat(node));
          const ck = await visitAsync_("key", node.key, visitor, path);
          if (ck === BREAK)
            return BREAK;
          else if (ck === REMOVE)
            node.key = null;
          const cv = await visitAsync_("value", node.value, visitor, path);
          if (cv === BREAK)
            return BREAK;
          else if (cv === REMOVE)
            node.value = null;
        }
      }
      return ctrl;
    }
    function initVisitor(visitor) {
      if (typeof visitor === "object" && (visitor.Collection || visitor.Node || visitor.Value)) {
        return Object.assign({
          Alias: visitor.Node,
          Map: visitor.Node,
          Scalar: visitor.Node,
          Seq: visitor.Node
        }, visitor.Value && {
          Map: visitor.Value,
          Scalar: visitor.Value,
          Seq: visitor.Value
        }, visitor.Collection && {
          Map: visitor.Collection,
          Seq: visitor.Collection
        }, visitor);
      }
      return visitor;
    }
    function callVisitor(key, node, visitor, path) {
      if (typeof visitor === "function")
        return visitor(key, node, path);
      if (identity.isMap(node))
        return visitor.Map?.(key, node, path);
      if (identity.isSeq(node))
        return visitor.Seq?.(key, node, path);
      if (identity.isPair(node))
        return visitor.Pair?.(key, node, path);
      if (identity.isScalar(node))
        return visitor.Scalar?.(key, node, path);
      if (identity.isAlias(node))
        return visitor.Alias?.(key, node, path);
      return void 0;
    }
    function replaceNode(key, path, node) {
      const parent = path[path.length - 1];
      if (identity.isCollection(parent)) {
        parent.items[key] = node;
      } else if (identity.isPair(parent)) {
        if (key === "key")
          parent.key = node;
        else
          parent.value = node;
      } else if (identity.isDocument(parent)) {
        parent.contents = node;
      } else {
        const pt = identity.isAlias(parent) ? "alias" : "scalar";
        throw new Error(`Cannot replace node with ${pt} parent`);
      }
    }
    exports.visit = visit3;
    exports.visitAsync = visitAsync;
  }
});

// node_modules/yaml/dist/doc/directives.js
var require_directives = __commonJS({
  "node_modules/yaml/dist/doc/directives.js"(exports) {
    "use strict";
    var identity = require_identity();
    var visit3 = require_visit();
    var escapeChars = {
      "!": "%21",
      ",": "%2C",
      "[": "%5B",
      "]": "%5D",
      "{": "%7B",
      "}": "%7D"
    };
    var escapeTagName = (tn) => tn.replace(/[!,[\]{}]/g, (ch) => escapeChars[ch]);
    var Directives = class _Directives {
      constructor(yaml, tags) {
        this.docStart = null;
        this.docEnd = false;
        this.yaml = Object.assign({}, _Directives.defaultYaml, yaml);
        this.tags = Object.assign({}, _Directives.defaultTags, tags);
      }
      clone() {
        const copy = new _Directives(this.yaml, this.tags);
        copy.docStart = this.docStart;
        return copy;
      }
      /**
       * During parsing, get a Directives instance for the current document and
       * update the stream state according to the current version's spec.
       */
      atDocument() {
        const res = new _Directives(this.yaml, this.tags);
        switch (this.yaml.version) {
          case "1.1":
            this.atNextDocument = true;
            break;
          case "1.2":
            this.atNextDocument = false;
            this.yaml = {
              explicit: _Directives.defaultYaml.explicit,
              version: "1.2"
            };
            this.tags = Object.assign({}, _Directives.defaultTags);
            break;
        }
        return res;
      }
      /**
       * @param onError - May be called even if the action was successful
       * @returns `true` on success
       */
      add(line, onError) {
        if (this.atNextDocument) {
          this.yaml = { explicit: _Directives.defaultYaml.explicit, version: "1.1" };
          this.tags = Object.assign({}, _Directives.defaultTags);
          this.atNextDocument = false;
        }
        const parts = line.trim().split(/[ \t]+/);
        const name = parts.shift();
        switch (name) {
          case "%TAG": {
            if (parts.length !== 2) {
              onError(0, "%TAG directive should contain exactly two parts");
              if (parts.length < 2)
                return false;
            }
            const [handle, prefix] = parts;
            this.tags[handle] = prefix;
            return true;
          }
          case "%YAML": {
            this.yaml.explicit = true;
            if (parts.length !== 1) {
              onError(0, "%YAML directive should contain exactly one part");
              return false;
            }
            const [version] = parts;
            if (version === "1.1" || version === "1.2") {
              this.yaml.version = version;
              return true;
            } else {
              const isValid = /^\d+\.\d+$/.test(version);
              onError(6, `Unsupported YAML version ${version}`, isValid);
              return false;
            }
          }
          default:
            onError(0, `Unknown directive ${name}`, true);
            return false;
        }
      }
      /**
       * Resolves a tag, matching handles to those defined in %TAG directives.
       *
       * @returns Resolved tag, which may also be the non-specific tag `'!'` or a
       *   `'!local'` tag, or `null` if unresolvable.
       */
      tagName(source, onError) {
        if (source === "!")
          return "!";
        if (source[0] !== "!") {
          onError(`Not a valid tag: ${source}`);
          return null;
        }
        if (source[1] === "<") {
          const verbatim = source.slice(2, -1);
          if (verbatim === "!" || verbatim === "!!") {
            onError(`Verbatim tags aren't resolved, so ${source} is invalid.`);
            return null;
          }
          if (source[source.length - 1] !== ">")
            onError("Verbatim tags must end with a >");
          return verbatim;
        }
        const [, handle, suffix] = source.match(/^(.*!)([^!]*)$/s);
        if (!suffix)
          onError(`The ${source} tag has no suffix`);
        const prefix = this.tags[handle];
        if (prefix) {
          try {
            return prefix + decodeURIComponent(suffix);
          } catch (error) {
            onError(String(error));
            return null;
          }
        }
        if (handle === "!")
          return source;
        onError(`Could not resolve tag: ${source}`);
        return null;
      }
      /**
       * Given a fully resolved tag, returns its printable string form,
       * taking into account current tag prefixes and defaults.
       */
      tagString(tag) {
        for (const [handle, prefix] of Object.entries(this.tags)) {
          if (tag.startsWith(prefix))
            return handle + escapeTagName(tag.substring(prefix.length));
        }
        return tag[0] === "!" ? tag : `!<${tag}>`;
      }
      toString(doc) {
        const lines = this.yaml.explicit ? [`%YAML ${this.yaml.version || "1.2"}`] : [];
        const tagEntries = Object.entries(this.tags);
        let tagNames;
        if (doc && tagEntries.length > 0 && identity.isNode(doc.contents)) {
          const tags = {};
          visit3.visit(doc.contents, (_key, node) => {
            if (identity.isNode(node) && node.tag)
              tags[node.tag] = true;
          });
          tagNames = Object.keys(tags);
        } else
          tagNames = [];
        for (const [handle, prefix] of tagEntries) {
          if (handle === "!!" && prefix === "tag:yaml.org,2002:")
            continue;
          if (!doc || tagNames.some((tn) => tn.startsWith(prefix)))
            lines.push(`%TAG ${handle} ${prefix}`);
        }
        return lines.join("\n");
      }
    };
    Directives.defaultYaml = { explicit: false, version: "1.2" };
    Directives.defaultTags = { "!!": "tag:yaml.org,2002:" };
    exports.Directives = Directives;
  }
});

// node_modules/yaml/dist/doc/anchors.js
var require_anchors = __commonJS({
  "node_modules/yaml/dist/doc/anchors.js"(exports) {
    "use strict";
    var identity = require_identity();
    var visit3 = require_visit();
    function anchorIsValid(anchor) {
      if (/[\x00-\x19\s,[\]{}]/.test(anchor)) {
        const sa = JSON.stringify(anchor);
        const msg = `Anchor must not contain whitespace or control characters: ${sa}`;
        throw new Error(msg);
      }
      return true;
    }
    function anchorNames(root) {
      const anchors = /* @__PURE__ */ new Set();
      visit3.visit(root, {
        Value(_key, node) {
          if (node.anchor)
            anchors.add(node.anchor);
        }
      });
      return anchors;
    }
    function findNewAnchor(prefix, exclude) {
      for (let i = 1; true; ++i) {
        const name = `${prefix}${i}`;
        if (!exclude.has(name))
          return name;
      }
    }
    function createNodeAnchors(doc, prefix) {
      const aliasObjects = [];
      const sourceObjects = /* @__PURE__ */ new Map();
      let prevAnchors = null;
      return {
        onAnchor: (source) => {
          aliasObjects.push(source);
          prevAnchors ?? (prevAnchors = anchorNames(doc));
          const anchor = findNewAnchor(prefix, prevAnchors);
          prevAnchors.add(anchor);
          return anchor;
        },
        /**
         * With circular references, the source node is only resolved after all
         * of its child nodes are. This is why anchors are set only after all of
         * the nodes have been created.
         */
        setAnchors: () => {
          for (const source of aliasObjects) {
            const ref = sourceObjects.get(source);
            if (typeof ref === "object" && ref.anchor && (identity.isScalar(ref.node) || identity.isCollection(ref.node))) {
              ref.node.anchor = ref.anchor;
            } else {
              const error = new Error("Failed to resolve repeated object (this should not happen)");
              error.source = source;
              throw error;
            }
          }
        },
        sourceObjects
      };
    }
    exports.anchorIsValid = anchorIsValid;
    exports.anchorNames = anchorNames;
    exports.createNodeAnchors = createNodeAnchors;
    exports.findNewAnchor = findNewAnchor;
  }
});

// node_modules/yaml/dist/doc/applyReviver.js
var require_applyReviver = __commonJS({
  "node_modules/yaml/dist/doc/applyReviver.js"(exports) {
    "use strict";
    function applyReviver(reviver, obj, key, val) {
      if (val && typeof val === "object") {
        if (Array.isArray(val)) {
          for (let i = 0, len = val.length; i < len; ++i) {
            const v0 = val[i];
            const v1 = applyReviver(reviver, val, String(i), v0);
            if (v1 === void 0)
              delete val[i];
            else if (v1 !== v0)
              val[i] = v1;
          }
        } else if (val instanceof Map) {
          for (const k of Array.from(val.keys())) {
            const v0 = val.get(k);
            const v1 = applyReviver(reviver, val, k, v0);
            if (v1 === void 0)
              val.delete(k);
            else if (v1 !== v0)
              val.set(k, v1);
          }
        } else if (val instanceof Set) {
          for (const v0 of Array.from(val)) {
            const v1 = applyReviver(reviver, val, v0, v0);
            if (v1 === void 0)
              val.delete(v0);
            else if (v1 !== v0) {
              val.delete(v0);
              val.add(v1);
            }
          }
        } else {
          for (const [k, v0] of Object.entries(val)) {
            const v1 = applyReviver(reviver, val, k, v0);
            if (v1 === void 0)
              delete val[k];
            else if (v1 !== v0)
              val[k] = v1;
          }
        }
      }
      return reviver.call(obj, key, val);
    }
    exports.applyReviver = applyReviver;
  }
});

// node_modules/yaml/dist/nodes/toJS.js
var require_toJS = __commonJS({
  "node_modules/yaml/dist/nodes/toJS.js"(exports) {
    "use strict";
    var identity = require_identity();
    function toJS(value, arg, ctx) {
      if (Array.isArray(value))
        return value.map((v, i) => toJS(v, String(i), ctx));
      if (value && typeof value.toJSON === "function") {
        if (!ctx || !identity.hasAnchor(value))
          return value.toJSON(arg, ctx);
        const data = { aliasCount: 0, count: 1, res: void 0 };
        ctx.anchors.set(value, data);
        ctx.onCreate = (res2) => {
          data.res = res2;
          delete ctx.onCreate;
        };
        const res = value.toJSON(arg, ctx);
        if (ctx.onCreate)
          ctx.onCreate(res);
        return res;
      }
      if (typeof value === "bigint" && !ctx?.keep)
        return Number(value);
      return value;
    }
    exports.toJS = toJS;
  }
});

// node_modules/yaml/dist/nodes/Node.js
var require_Node = __commonJS({
  "node_modules/yaml/dist/nodes/Node.js"(exports) {
    "use strict";
    var applyReviver = require_applyReviver();
    var identity = require_identity();
    var toJS = require_toJS();
    var NodeBase = class {
      constructor(type) {
        Object.defineProperty(this, identity.NODE_TYPE, { value: type });
      }
      /** Create a copy of this node.  */
      clone() {
        const copy = Object.create(Object.getPrototypeOf(this), Object.getOwnPropertyDescriptors(this));
        if (this.range)
          copy.range = this.range.slice();
        return copy;
      }
      /** A plain JavaScript representation of this node. */
      toJS(doc, { mapAsMap, maxAliasCount, onAnchor, reviver } = {}) {
        if (!identity.isDocument(doc))
          throw new TypeError("A document argument is required");
        const ctx = {
          anchors: /* @__PURE__ */ new Map(),
          doc,
          keep: true,
          mapAsMap: mapAsMap === true,
          mapKeyWarned: false,
          maxAliasCount: typeof maxAliasCount === "number" ? maxAliasCount : 100
        };
        const res = toJS.toJS(this, "", ctx);
        if (typeof onAnchor === "function")
          for (const { count, res: res2 } of ctx.anchors.values())
            onAnchor(res2, count);
        return typeof reviver === "function" ? applyReviver.applyReviver(reviver, { "": res }, "", res) : res;
      }
    };
    exports.NodeBase = NodeBase;
  }
});

// node_modules/yaml/dist/nodes/Alias.js
var require_Alias = __commonJS({
  "node_modules/yaml/dist/nodes/Alias.js"(exports) {
    "use strict";
    var anchors = require_anchors();
    var visit3 = require_visit();
    var identity = require_identity();
    var Node = require_Node();
    var toJS = require_toJS();
    var Alias = class extends Node.NodeBase {
      constructor(source) {
        super(identity.ALIAS);
        this.source = source;
        Object.defineProperty(this, "tag", {
          set() {
            throw new Error("Alias nodes cannot have tags");
          }
        });
      }
      /**
       * Resolve the value of this alias within `doc`, finding the last
       * instance of the `source` anchor before this node.
       */
      resolve(doc, ctx) {
        if (ctx?.maxAliasCount === 0)
          throw new ReferenceError("Alias resolution is disabled");
        let nodes;
        if (ctx?.aliasResolveCache) {
          nodes = ctx.aliasResolveCache;
        } else {
          nodes = [];
          visit3.visit(doc, {
            Node: (_key, node) => {
              if (identity.isAlias(node) || identity.hasAnchor(node))
                nodes.push(node);
            }
          });
          if (ctx)
            ctx.aliasResolveCache = nodes;
        }
        let found = void 0;
        for (const node of nodes) {
          if (node === this)
            break;
          if (node.anchor === this.source)
            found = node;
        }
        if (found && ctx) {
          const { anchors: anchors2, doc: doc2, maxAliasCount } = ctx;
          let data = anchors2.get(found);
          if (!data) {
            toJS.toJS(found, null, ctx);
            data = anchors2.get(found);
          }
          if (data?.res === void 0) {
            const msg = "This should not happen: Alias anchor was not resolved?";
            throw new ReferenceError(msg);
          }
          if (maxAliasCount >= 0) {
            data.count += 1;
            if (data.aliasCount === 0)
              data.aliasCount = getAliasCount(doc2, found, anchors2);
            if (data.count * data.aliasCount > maxAliasCount) {
              const msg = "Excessive alias count indicates a resource exhaustion attack";
              throw new ReferenceError(msg);
            }
          }
        }
        return found;
      }
      toJSON(_arg, ctx) {
        if (!ctx)
          return { source: this.source };
        const source = this.resolve(ctx.doc, ctx);
        if (!source) {
          const msg = `Unresolved alias (the anchor must be set before the alias): ${this.source}`;
          throw new ReferenceError(msg);
        }
        return ctx.anchors.get(source).res;
      }
      toString(ctx, _onComment, _onChompKeep) {
        const src = `*${this.source}`;
        if (ctx) {
          anchors.anchorIsValid(this.source);
          if (ctx.options.verifyAliasOrder && !ctx.anchors.has(this.source)) {
            const msg = `Unresolved alias (the anchor must be set before the alias): ${this.source}`;
            throw new Error(msg);
          }
          if (ctx.implicitKey)
            return `${src} `;
        }
        return src;
      }
    };
    function getAliasCount(doc, node, anchors2) {
      if (identity.isAlias(node)) {
        const source = node.resolve(doc);
        const anchor = anchors2 && source && anchors2.get(source);
        return anchor ? anchor.count * anchor.aliasCount : 0;
      } else if (identity.isCollection(node)) {
        let count = 0;
        for (const item of node.items) {
          const c = getAliasCount(doc, item, anchors2);
          if (c > count)
            count = c;
        }
        return count;
      } else if (identity.isPair(node)) {
        const kc = getAliasCount(doc, node.key, anchors2);
        const vc = getAliasCount(doc, node.value, anchors2);
        return Math.max(kc, vc);
      }
      return 1;
    }
    exports.Alias = Alias;
  }
});

// node_modules/yaml/dist/nodes/Scalar.js
var require_Scalar = __commonJS({
  "node_modules/yaml/dist/nodes/Scalar.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Node = require_Node();
    var toJS = require_toJS();
    var isScalarValue = (value) => !value || typeof value !== "function" && typeof value !== "object";
    var Scalar = class extends Node.NodeBase {
      constructor(value) {
        super(identity.SCALAR);
        this.value = value;
      }
      toJSON(arg, ctx) {
        return ctx?.keep ? this.value : toJS.toJS(this.value, arg, ctx);
      }
      toString() {
        return String(this.value);
      }
    };
    Scalar.BLOCK_FOLDED = "BLOCK_FOLDED";
    Scalar.BLOCK_LITERAL = "BLOCK_LITERAL";
    Scalar.PLAIN = "PLAIN";
    Scalar.QUOTE_DOUBLE = "QUOTE_DOUBLE";
    Scalar.QUOTE_SINGLE = "QUOTE_SINGLE";
    exports.Scalar = Scalar;
    exports.isScalarValue = isScalarValue;
  }
});

// node_modules/yaml/dist/doc/createNode.js
var require_createNode = __commonJS({
  "node_modules/yaml/dist/doc/createNode.js"(exports) {
    "use strict";
    var Alias = require_Alias();
    var identity = require_identity();
    var Scalar = require_Scalar();
    var defaultTagPrefix = "tag:yaml.org,2002:";
    function findTagObject(value, tagName, tags) {
      if (tagName) {
        const match = tags.filter((t) => t.tag === tagName);
        const tagObj = match.find((t) => !t.format) ?? match[0];
        if (!tagObj)
          throw new Error(`Tag ${tagName} not found`);
        return tagObj;
      }
      return tags.find((t) => t.identify?.(value) && !t.format);
    }
    function createNode(value, tagName, ctx) {
      if (identity.isDocument(value))
        value = value.contents;
      if (identity.isNode(value))
        return value;
      if (identity.isPair(value)) {
        const map = ctx.schema[identity.MAP].createNode?.(ctx.schema, null, ctx);
        map.items.push(value);
        return map;
      }
      if (value instanceof String || value instanceof Number || value instanceof Boolean || typeof BigInt !== "undefined" && value instanceof BigInt) {
        value = value.valueOf();
      }
      const { aliasDuplicateObjects, onAnchor, onTagObj, schema, sourceObjects } = ctx;
      let ref = void 0;
      if (aliasDuplicateObjects && value && typeof value === "object") {
        ref = sourceObjects.get(value);
        if (ref) {
          ref.anchor ?? (ref.anchor = onAnchor(value));
          return new Alias.Alias(ref.anchor);
        } else {
          ref = { anchor: null, node: null };
          sourceObjects.set(value, ref);
        }
      }
      if (tagName?.startsWith("!!"))
        tagName = defaultTagPrefix + tagName.slice(2);
      let tagObj = findTagObject(value, tagName, schema.tags);
      if (!tagObj) {
        if (value && typeof value.toJSON === "function") {
          value = value.toJSON();
        }
        if (!value || typeof value !== "object") {
          const node2 = new Scalar.Scalar(value);
          if (ref)
            ref.node = node2;
          return node2;
        }
        tagObj = value instanceof Map ? schema[identity.MAP] : Symbol.iterator in Object(value) ? schema[identity.SEQ] : schema[identity.MAP];
      }
      if (onTagObj) {
        onTagObj(tagObj);
        delete ctx.onTagObj;
      }
      const node = tagObj?.createNode ? tagObj.createNode(ctx.schema, value, ctx) : typeof tagObj?.nodeClass?.from === "function" ? tagObj.nodeClass.from(ctx.schema, value, ctx) : new Scalar.Scalar(value);
      if (tagName)
        node.tag = tagName;
      else if (!tagObj.default)
        node.tag = tagObj.tag;
      if (ref)
        ref.node = node;
      return node;
    }
    exports.createNode = createNode;
  }
});

// node_modules/yaml/dist/nodes/Collection.js
var require_Collection = __commonJS({
  "node_modules/yaml/dist/nodes/Collection.js"(exports) {
    "use strict";
    var createNode = require_createNode();
    var identity = require_identity();
    var Node = require_Node();
    function collectionFromPath(schema, path, value) {
      let v = value;
      for (let i = path.length - 1; i >= 0; --i) {
        const k = path[i];
        if (typeof k === "number" && Number.isInteger(k) && k >= 0) {
          const a = [];
          a[k] = v;
          v = a;
        } else {
          v = /* @__PURE__ */ new Map([[k, v]]);
        }
      }
      return createNode.createNode(v, void 0, {
        aliasDuplicateObjects: false,
        keepUndefined: false,
        onAnchor: () => {
          throw new Error("This should not happen, please report a bug.");
        },
        schema,
        sourceObjects: /* @__PURE__ */ new Map()
      });
    }
    var isEmptyPath = (path) => path == null || typeof path === "object" && !!path[Symbol.iterator]().next().done;
    var Collection = class extends Node.NodeBase {
      constructor(type, schema) {
        super(type);
        Object.defineProperty(this, "schema", {
          value: schema,
          configurable: true,
          enumerable: false,
          writable: true
        });
      }
      /**
       * Create a copy of this collection.
       *
       * @param schema - If defined, overwrites the original's schema
       */
      clone(schema) {
        const copy = Object.create(Object.getPrototypeOf(this), Object.getOwnPropertyDescriptors(this));
        if (schema)
          copy.schema = schema;
        copy.items = copy.items.map((it) => identity.isNode(it) || identity.isPair(it) ? it.clone(schema) : it);
        if (this.range)
          copy.range = this.range.slice();
        return copy;
      }
      /**
       * Adds a value to the collection. For `!!map` and `!!omap` the value must
       * be a Pair instance or a `{ key, value }` object, which may not have a key
       * that already exists in the map.
       */
      addIn(path, value) {
        if (isEmptyPath(path))
          this.add(value);
        else {
          const [key, ...rest] = path;
          const node = this.get(key, true);
          if (identity.isCollection(node))
            node.addIn(rest, value);
          else if (node === void 0 && this.schema)
            this.set(key, collectionFromPath(this.schema, rest, value));
          else
            throw new Error(`Expected YAML collection at ${key}. Remaining path: ${rest}`);
        }
      }
      /**
       * Removes a value from the collection.
       * @returns `true` if the item was found and removed.
       */
      deleteIn(path) {
        const [key, ...rest] = path;
        if (rest.length === 0)
          return this.delete(key);
        const node = this.get(key, true);
        if (identity.isCollection(node))
          return node.deleteIn(rest);
        else
          throw new Error(`Expected YAML collection at ${key}. Remaining path: ${rest}`);
      }
      /**
       * Returns item at `key`, or `undefined` if not found. By default unwraps
       * scalar values from their surrounding node; to disable set `keepScalar` to
       * `true` (collections are always returned intact).
       */
      getIn(path, keepScalar) {
        const [key, ...rest] = path;
        const node = this.get(key, true);
        if (rest.length === 0)
          return !keepScalar && identity.isScalar(node) ? node.value : node;
        else
          return identity.isCollection(node) ? node.getIn(rest, keepScalar) : void 0;
      }
      hasAllNullValues(allowScalar) {
        return this.items.every((node) => {
          if (!identity.isPair(node))
            return false;
          const n = node.value;
          return n == null || allowScalar && identity.isScalar(n) && n.value == null && !n.commentBefore && !n.comment && !n.tag;
        });
      }
      /**
       * Checks if the collection includes a value with the key `key`.
       */
      hasIn(path) {
        const [key, ...rest] = path;
        if (rest.length === 0)
          return this.has(key);
        const node = this.get(key, true);
        return identity.isCollection(node) ? node.hasIn(rest) : false;
      }
      /**
       * Sets a value in this collection. For `!!set`, `value` needs to be a
       * boolean to add/remove the item from the set.
       */
      setIn(path, value) {
        const [key, ...rest] = path;
        if (rest.length === 0) {
          this.set(key, value);
        } else {
          const node = this.get(key, true);
          if (identity.isCollection(node))
            node.setIn(rest, value);
          else if (node === void 0 && this.schema)
            this.set(key, collectionFromPath(this.schema, rest, value));
          else
            throw new Error(`Expected YAML collection at ${key}. Remaining path: ${rest}`);
        }
      }
    };
    exports.Collection = Collection;
    exports.collectionFromPath = collectionFromPath;
    exports.isEmptyPath = isEmptyPath;
  }
});

// node_modules/yaml/dist/stringify/stringifyComment.js
var require_stringifyComment = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyComment.js"(exports) {
    "use strict";
    var stringifyComment = (str) => str.replace(/^(?!$)(?: $)?/gm, "#");
    function indentComment(comment, indent) {
      if (/^\n+$/.test(comment))
        return comment.substring(1);
      return indent ? comment.replace(/^(?! *$)/gm, indent) : comment;
    }
    var lineComment = (str, indent, comment) => str.endsWith("\n") ? indentComment(comment, indent) : comment.includes("\n") ? "\n" + indentComment(comment, indent) : (str.endsWith(" ") ? "" : " ") + comment;
    exports.indentComment = indentComment;
    exports.lineComment = lineComment;
    exports.stringifyComment = stringifyComment;
  }
});

// node_modules/yaml/dist/stringify/foldFlowLines.js
var require_foldFlowLines = __commonJS({
  "node_modules/yaml/dist/stringify/foldFlowLines.js"(exports) {
    "use strict";
    var FOLD_FLOW = "flow";
    var FOLD_BLOCK = "block";
    var FOLD_QUOTED = "quoted";
    function foldFlowLines(text, indent, mode = "flow", { indentAtStart, lineWidth = 80, minContentWidth = 20, onFold, onOverflow } = {}) {
      if (!lineWidth || lineWidth < 0)
        return text;
      if (lineWidth < minContentWidth)
        minContentWidth = 0;
      const endStep = Math.max(1 + minContentWidth, 1 + lineWidth - indent.length);
      if (text.length <= endStep)
        return text;
      const folds = [];
      const escapedFolds = {};
      let end = lineWidth - indent.length;
      if (typeof indentAtStart === "number") {
        if (indentAtStart > lineWidth - Math.max(2, minContentWidth))
          folds.push(0);
        else
          end = lineWidth - indentAtStart;
      }
      let split = void 0;
      let prev = void 0;
      let overflow = false;
      let i = -1;
      let escStart = -1;
      let escEnd = -1;
      if (mode === FOLD_BLOCK) {
        i = consumeMoreIndentedLines(text, i, indent.length);
        if (i !== -1)
          end = i + endStep;
      }
      for (let ch; ch = text[i += 1]; ) {
        if (mode === FOLD_QUOTED && ch === "\\") {
          escStart = i;
          switch (text[i + 1]) {
            case "x":
              i += 3;
              break;
            case "u":
              i += 5;
              break;
            case "U":
              i += 9;
              break;
            default:
              i += 1;
          }
          escEnd = i;
        }
        if (ch === "\n") {
          if (mode === FOLD_BLOCK)
            i = consumeMoreIndentedLines(text, i, indent.length);
          end = i + indent.length + endStep;
          split = void 0;
        } else {
          if (ch === " " && prev && prev !== " " && prev !== "\n" && prev !== "	") {
            const next = text[i + 1];
            if (next && next !== " " && next !== "\n" && next !== "	")
              split = i;
          }
          if (i >= end) {
            if (split) {
              folds.push(split);
              end = split + endStep;
              split = void 0;
            } else if (mode === FOLD_QUOTED) {
              while (prev === " " || prev === "	") {
                prev = ch;
                ch = text[i += 1];
                overflow = true;
              }
              const j = i > escEnd + 1 ? i - 2 : escStart - 1;
              if (escapedFolds[j])
                return text;
              folds.push(j);
              escapedFolds[j] = true;
              end = j + endStep;
              split = void 0;
            } else {
              overflow = true;
            }
          }
        }
        prev = ch;
      }
      if (overflow && onOverflow)
        onOverflow();
      if (folds.length === 0)
        return text;
      if (onFold)
        onFold();
      let res = text.slice(0, folds[0]);
      for (let i2 = 0; i2 < folds.length; ++i2) {
        const fold = folds[i2];
        const end2 = folds[i2 + 1] || text.length;
        if (fold === 0)
          res = `
${indent}${text.slice(0, end2)}`;
        else {
          if (mode === FOLD_QUOTED && escapedFolds[fold])
            res += `${text[fold]}\\`;
          res += `
${indent}${text.slice(fold + 1, end2)}`;
        }
      }
      return res;
    }
    function consumeMoreIndentedLines(text, i, indent) {
      let end = i;
      let start = i + 1;
      let ch = text[start];
      while (ch === " " || ch === "	") {
        if (i < start + indent) {
          ch = text[++i];
        } else {
          do {
            ch = text[++i];
          } while (ch && ch !== "\n");
          end = i;
          start = i + 1;
          ch = text[start];
        }
      }
      return end;
    }
    exports.FOLD_BLOCK = FOLD_BLOCK;
    exports.FOLD_FLOW = FOLD_FLOW;
    exports.FOLD_QUOTED = FOLD_QUOTED;
    exports.foldFlowLines = foldFlowLines;
  }
});

// node_modules/yaml/dist/stringify/stringifyString.js
var require_stringifyString = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyString.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var foldFlowLines = require_foldFlowLines();
    var getFoldOptions = (ctx, isBlock) => ({
      indentAtStart: isBlock ? ctx.indent.length : ctx.indentAtStart,
      lineWidth: ctx.options.lineWidth,
      minContentWidth: ctx.options.minContentWidth
    });
    var containsDocumentMarker = (str) => /^(%|---|\.\.\.)/m.test(str);
    function lineLengthOverLimit(str, lineWidth, indentLength) {
      if (!lineWidth || lineWidth < 0)
        return false;
      const limit = lineWidth - indentLength;
      const strLen = str.length;
      if (strLen <= limit)
        return false;
      for (let i = 0, start = 0; i < strLen; ++i) {
        if (str[i] === "\n") {
          if (i - start > limit)
            return true;
          start = i + 1;
          if (strLen - start <= limit)
            return false;
        }
      }
      return true;
    }
    function doubleQuotedString(value, ctx) {
      const json = JSON.stringify(value);
      if (ctx.options.doubleQuotedAsJSON)
        return json;
      const { implicitKey } = ctx;
      const minMultiLineLength = ctx.options.doubleQuotedMinMultiLineLength;
      const indent = ctx.indent || (containsDocumentMarker(value) ? "  " : "");
      let str = "";
      let start = 0;
      for (let i = 0, ch = json[i]; ch; ch = json[++i]) {
        if (ch === " " && json[i + 1] === "\\" && json[i + 2] === "n") {
          str += json.slice(start, i) + "\\ ";
          i += 1;
          start = i;
          ch = "\\";
        }
        if (ch === "\\")
          switch (json[i + 1]) {
            case "u":
              {
                str += json.slice(start, i);
                const code = json.substr(i + 2, 4);
                switch (code) {
                  case "0000":
                    str += "\\0";
                    break;
                  case "0007":
                    str += "\\a";
                    break;
                  case "000b":
                    str += "\\v";
                    break;
                  case "001b":
                    str += "\\e";
                    break;
                  case "0085":
                    str += "\\N";
                    break;
                  case "00a0":
                    str += "\\_";
                    break;
                  case "2028":
                    str += "\\L";
                    break;
                  case "2029":
                    str += "\\P";
                    break;
                  default:
                    if (code.substr(0, 2) === "00")
                      str += "\\x" + code.substr(2);
                    else
                      str += json.substr(i, 6);
                }
                i += 5;
                start = i + 1;
              }
              break;
            case "n":
              if (implicitKey || json[i + 2] === '"' || json.length < minMultiLineLength) {
                i += 1;
              } else {
                str += json.slice(start, i) + "\n\n";
                while (json[i + 2] === "\\" && json[i + 3] === "n" && json[i + 4] !== '"') {
                  str += "\n";
                  i += 2;
                }
                str += indent;
                if (json[i + 2] === " ")
                  str += "\\";
                i += 1;
                start = i + 1;
              }
              break;
            default:
              i += 1;
          }
      }
      str = start ? str + json.slice(start) : json;
      return implicitKey ? str : foldFlowLines.foldFlowLines(str, indent, foldFlowLines.FOLD_QUOTED, getFoldOptions(ctx, false));
    }
    function singleQuotedString(value, ctx) {
      if (ctx.options.singleQuote === false || ctx.implicitKey && value.includes("\n") || /[ \t]\n|\n[ \t]/.test(value))
        return doubleQuotedString(value, ctx);
      const indent = ctx.indent || (containsDocumentMarker(value) ? "  " : "");
      const res = "'" + value.replace(/'/g, "''").replace(/\n+/g, `$&
${indent}`) + "'";
      return ctx.implicitKey ? res : foldFlowLines.foldFlowLines(res, indent, foldFlowLines.FOLD_FLOW, getFoldOptions(ctx, false));
    }
    function quotedString(value, ctx) {
      const { singleQuote } = ctx.options;
      let qs;
      if (singleQuote === false)
        qs = doubleQuotedString;
      else {
        const hasDouble = value.includes('"');
        const hasSingle = value.includes("'");
        if (hasDouble && !hasSingle)
          qs = singleQuotedString;
        else if (hasSingle && !hasDouble)
          qs = doubleQuotedString;
        else
          qs = singleQuote ? singleQuotedString : doubleQuotedString;
      }
      return qs(value, ctx);
    }
    var blockEndNewlines;
    try {
      blockEndNewlines = new RegExp("(^|(?<!\n))\n+(?!\n|$)", "g");
    } catch {
      blockEndNewlines = /\n+(?!\n|$)/g;
    }
    function blockString({ comment, type, value }, ctx, onComment, onChompKeep) {
      const { blockQuote, commentString, lineWidth } = ctx.options;
      if (!blockQuote || /\n[\t ]+$/.test(value)) {
        return quotedString(value, ctx);
      }
      const indent = ctx.indent || (ctx.forceBlockIndent || containsDocumentMarker(value) ? "  " : "");
      const literal = blockQuote === "literal" ? true : blockQuote === "folded" || type === Scalar.Scalar.BLOCK_FOLDED ? false : type === Scalar.Scalar.BLOCK_LITERAL ? true : !lineLengthOverLimit(value, lineWidth, indent.length);
      if (!value)
        return literal ? "|\n" : ">\n";
      let chomp;
      let endStart;
      for (endStart = value.length; endStart > 0; --endStart) {
        const ch = value[endStart - 1];
        if (ch !== "\n" && ch !== "	" && ch !== " ")
          break;
      }
      let end = value.substring(endStart);
      const endNlPos = end.indexOf("\n");
      if (endNlPos === -1) {
        chomp = "-";
      } else if (value === end || endNlPos !== end.length - 1) {
        chomp = "+";
        if (onChompKeep)
          onChompKeep();
      } else {
        chomp = "";
      }
      if (end) {
        value = value.slice(0, -end.length);
        if (end[end.length - 1] === "\n")
          end = end.slice(0, -1);
        end = end.replace(blockEndNewlines, `$&${indent}`);
      }
      let startWithSpace = false;
      let startEnd;
      let startNlPos = -1;
      for (startEnd = 0; startEnd < value.length; ++startEnd) {
        const ch = value[startEnd];
        if (ch === " ")
          startWithSpace = true;
        else if (ch === "\n")
          startNlPos = startEnd;
        else
          break;
      }
      let start = value.substring(0, startNlPos < startEnd ? startNlPos + 1 : startEnd);
      if (start) {
        value = value.substring(start.length);
        start = start.replace(/\n+/g, `$&${indent}`);
      }
      const indentSize = indent ? "2" : "1";
      let header = (startWithSpace ? indentSize : "") + chomp;
      if (comment) {
        header += " " + commentString(comment.replace(/ ?[\r\n]+/g, " "));
        if (onComment)
          onComment();
      }
      if (!literal) {
        const foldedValue = value.replace(/\n+/g, "\n$&").replace(/(?:^|\n)([\t ].*)(?:([\n\t ]*)\n(?![\n\t ]))?/g, "$1$2").replace(/\n+/g, `$&${indent}`);
        let literalFallback = false;
        const foldOptions = getFoldOptions(ctx, true);
        if (blockQuote !== "folded" && type !== Scalar.Scalar.BLOCK_FOLDED) {
          foldOptions.onOverflow = () => {
            literalFallback = true;
          };
        }
        const body = foldFlowLines.foldFlowLines(`${start}${foldedValue}${end}`, indent, foldFlowLines.FOLD_BLOCK, foldOptions);
        if (!literalFallback)
          return `>${header}
${indent}${body}`;
      }
      value = value.replace(/\n+/g, `$&${indent}`);
      return `|${header}
${indent}${start}${value}${end}`;
    }
    function plainString(item, ctx, onComment, onChompKeep) {
      const { type, value } = item;
      const { actualString, implicitKey, indent, indentStep, inFlow } = ctx;
      if (implicitKey && value.includes("\n") || inFlow && /[[\]{},]/.test(value)) {
        return quotedString(value, ctx);
      }
      if (/^[\n\t ,[\]{}#&*!|>'"%@`]|^[?-]$|^[?-][ \t]|[\n:][ \t]|[ \t]\n|[\n\t ]#|[\n\t :]$/.test(value)) {
        return implicitKey || inFlow || !value.includes("\n") ? quotedString(value, ctx) : blockString(item, ctx, onComment, onChompKeep);
      }
      if (!implicitKey && !inFlow && type !== Scalar.Scalar.PLAIN && value.includes("\n")) {
        return blockString(item, ctx, onComment, onChompKeep);
      }
      if (containsDocumentMarker(value)) {
        if (indent === "") {
          ctx.forceBlockIndent = true;
          return blockString(item, ctx, onComment, onChompKeep);
        } else if (implicitKey && indent === indentStep) {
          return quotedString(value, ctx);
        }
      }
      const str = value.replace(/\n+/g, `$&
${indent}`);
      if (actualString) {
        const test = (tag) => tag.default && tag.tag !== "tag:yaml.org,2002:str" && tag.test?.test(str);
        const { compat, tags } = ctx.doc.schema;
        if (tags.some(test) || compat?.some(test))
          return quotedString(value, ctx);
      }
      return implicitKey ? str : foldFlowLines.foldFlowLines(str, indent, foldFlowLines.FOLD_FLOW, getFoldOptions(ctx, false));
    }
    function stringifyString(item, ctx, onComment, onChompKeep) {
      const { implicitKey, inFlow } = ctx;
      const ss = typeof item.value === "string" ? item : Object.assign({}, item, { value: String(item.value) });
      let { type } = item;
      if (type !== Scalar.Scalar.QUOTE_DOUBLE) {
        if (/[\x00-\x08\x0b-\x1f\x7f-\x9f\u{D800}-\u{DFFF}]/u.test(ss.value))
          type = Scalar.Scalar.QUOTE_DOUBLE;
      }
      const _stringify = (_type) => {
        switch (_type) {
          case Scalar.Scalar.BLOCK_FOLDED:
          case Scalar.Scalar.BLOCK_LITERAL:
            return implicitKey || inFlow ? quotedString(ss.value, ctx) : blockString(ss, ctx, onComment, onChompKeep);
          case Scalar.Scalar.QUOTE_DOUBLE:
            return doubleQuotedString(ss.value, ctx);
          case Scalar.Scalar.QUOTE_SINGLE:
            return singleQuotedString(ss.value, ctx);
          case Scalar.Scalar.PLAIN:
            return plainString(ss, ctx, onComment, onChompKeep);
          default:
            return null;
        }
      };
      let res = _stringify(type);
      if (res === null) {
        const { defaultKeyType, defaultStringType } = ctx.options;
        const t = implicitKey && defaultKeyType || defaultStringType;
        res = _stringify(t);
        if (res === null)
          throw new Error(`Unsupported default string type ${t}`);
      }
      return res;
    }
    exports.stringifyString = stringifyString;
  }
});

// node_modules/yaml/dist/stringify/stringify.js
var require_stringify = __commonJS({
  "node_modules/yaml/dist/stringify/stringify.js"(exports) {
    "use strict";
    var anchors = require_anchors();
    var identity = require_identity();
    var stringifyComment = require_stringifyComment();
    var stringifyString = require_stringifyString();
    function createStringifyContext(doc, options) {
      const opt = Object.assign({
        blockQuote: true,
        commentString: stringifyComment.stringifyComment,
        defaultKeyType: null,
        defaultStringType: "PLAIN",
        directives: null,
        doubleQuotedAsJSON: false,
        doubleQuotedMinMultiLineLength: 40,
        falseStr: "false",
        flowCollectionPadding: true,
        indentSeq: true,
        lineWidth: 80,
        minContentWidth: 20,
        nullStr: "null",
        simpleKeys: false,
        singleQuote: null,
        trailingComma: false,
        trueStr: "true",
        verifyAliasOrder: true
      }, doc.schema.toStringOptions, options);
      let inFlow;
      switch (opt.collectionStyle) {
        case "block":
          inFlow = false;
          break;
        case "flow":
          inFlow = true;
          break;
        default:
          inFlow = null;
      }
      return {
        anchors: /* @__PURE__ */ new Set(),
        doc,
        flowCollectionPadding: opt.flowCollectionPadding ? " " : "",
        indent: "",
        indentStep: typeof opt.indent === "number" ? " ".repeat(opt.indent) : "  ",
        inFlow,
        options: opt
      };
    }
    function getTagObject(tags, item) {
      if (item.tag) {
        const match = tags.filter((t) => t.tag === item.tag);
        if (match.length > 0)
          return match.find((t) => t.format === item.format) ?? match[0];
      }
      let tagObj = void 0;
      let obj;
      if (identity.isScalar(item)) {
        obj = item.value;
        let match = tags.filter((t) => t.identify?.(obj));
        if (match.length > 1) {
          const testMatch = match.filter((t) => t.test);
          if (testMatch.length > 0)
            match = testMatch;
        }
        tagObj = match.find((t) => t.format === item.format) ?? match.find((t) => !t.format);
      } else {
        obj = item;
        tagObj = tags.find((t) => t.nodeClass && obj instanceof t.nodeClass);
      }
      if (!tagObj) {
        const name = obj?.constructor?.name ?? (obj === null ? "null" : typeof obj);
        throw new Error(`Tag not resolved for ${name} value`);
      }
      return tagObj;
    }
    function stringifyProps(node, tagObj, { anchors: anchors$1, doc }) {
      if (!doc.directives)
        return "";
      const props = [];
      const anchor = (identity.isScalar(node) || identity.isCollection(node)) && node.anchor;
      if (anchor && anchors.anchorIsValid(anchor)) {
        anchors$1.add(anchor);
        props.push(`&${anchor}`);
      }
      const tag = node.tag ?? (tagObj.default ? null : tagObj.tag);
      if (tag)
        props.push(doc.directives.tagString(tag));
      return props.join(" ");
    }
    function stringify(item, ctx, onComment, onChompKeep) {
      if (identity.isPair(item))
        return item.toString(ctx, onComment, onChompKeep);
      if (identity.isAlias(item)) {
        if (ctx.doc.directives)
          return item.toString(ctx);
        if (ctx.resolvedAliases?.has(item)) {
          throw new TypeError(`Cannot stringify circular structure without alias nodes`);
        } else {
          if (ctx.resolvedAliases)
            ctx.resolvedAliases.add(item);
          else
            ctx.resolvedAliases = /* @__PURE__ */ new Set([item]);
          item = item.resolve(ctx.doc);
        }
      }
      let tagObj = void 0;
      const node = identity.isNode(item) ? item : ctx.doc.createNode(item, { onTagObj: (o) => tagObj = o });
      tagObj ?? (tagObj = getTagObject(ctx.doc.schema.tags, node));
      const props = stringifyProps(node, tagObj, ctx);
      if (props.length > 0)
        ctx.indentAtStart = (ctx.indentAtStart ?? 0) + props.length + 1;
      const str = typeof tagObj.stringify === "function" ? tagObj.stringify(node, ctx, onComment, onChompKeep) : identity.isScalar(node) ? stringifyString.stringifyString(node, ctx, onComment, onChompKeep) : node.toString(ctx, onComment, onChompKeep);
      if (!props)
        return str;
      return identity.isScalar(node) || str[0] === "{" || str[0] === "[" ? `${props} ${str}` : `${props}
${ctx.indent}${str}`;
    }
    exports.createStringifyContext = createStringifyContext;
    exports.stringify = stringify;
  }
});

// node_modules/yaml/dist/stringify/stringifyPair.js
var require_stringifyPair = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyPair.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Scalar = require_Scalar();
    var stringify = require_stringify();
    var stringifyComment = require_stringifyComment();
    function stringifyPair({ key, value }, ctx, onComment, onChompKeep) {
      const { allNullValues, doc, indent, indentStep, options: { commentString, indentSeq, simpleKeys } } = ctx;
      let keyComment = identity.isNode(key) && key.comment || null;
      if (simpleKeys) {
        if (keyComment) {
          throw new Error("With simple keys, key nodes cannot have comments");
        }
        if (identity.isCollection(key) || !identity.isNode(key) && typeof key === "object") {
          const msg = "With simple keys, collection cannot be used as a key value";
          throw new Error(msg);
        }
      }
      let explicitKey = !simpleKeys && (!key || keyComment && value == null && !ctx.inFlow || identity.isCollection(key) || (identity.isScalar(key) ? key.type === Scalar.Scalar.BLOCK_FOLDED || key.type === Scalar.Scalar.BLOCK_LITERAL : typeof key === "object"));
      ctx = Object.assign({}, ctx, {
        allNullValues: false,
        implicitKey: !explicitKey && (simpleKeys || !allNullValues),
        indent: indent + indentStep
      });
      let keyCommentDone = false;
      let chompKeep = false;
      let str = stringify.stringify(key, ctx, () => keyCommentDone = true, () => chompKeep = true);
      if (!explicitKey && !ctx.inFlow && str.length > 1024) {
        if (simpleKeys)
          throw new Error("With simple keys, single line scalar must not span more than 1024 characters");
        explicitKey = true;
      }
      if (ctx.inFlow) {
        if (allNullValues || value == null) {
          if (keyCommentDone && onComment)
            onComment();
          return str === "" ? "?" : explicitKey ? `? ${str}` : str;
        }
      } else if (allNullValues && !simpleKeys || value == null && explicitKey) {
        str = `? ${str}`;
        if (keyComment && !keyCommentDone) {
          str += stringifyComment.lineComment(str, ctx.indent, commentString(keyComment));
        } else if (chompKeep && onChompKeep)
          onChompKeep();
        return str;
      }
      if (keyCommentDone)
        keyComment = null;
      if (explicitKey) {
        if (keyComment)
          str += stringifyComment.lineComment(str, ctx.indent, commentString(keyComment));
        str = `? ${str}
${indent}:`;
      } else {
        str = `${str}:`;
        if (keyComment)
          str += stringifyComment.lineComment(str, ctx.indent, commentString(keyComment));
      }
      let vsb, vcb, valueComment;
      if (identity.isNode(value)) {
        vsb = !!value.spaceBefore;
        vcb = value.commentBefore;
        valueComment = value.comment;
      } else {
        vsb = false;
        vcb = null;
        valueComment = null;
        if (value && typeof value === "object")
          value = doc.createNode(value);
      }
      ctx.implicitKey = false;
      if (!explicitKey && !keyComment && identity.isScalar(value))
        ctx.indentAtStart = str.length + 1;
      chompKeep = false;
      if (!indentSeq && indentStep.length >= 2 && !ctx.inFlow && !explicitKey && identity.isSeq(value) && !value.flow && !value.tag && !value.anchor) {
        ctx.indent = ctx.indent.substring(2);
      }
      let valueCommentDone = false;
      const valueStr = stringify.stringify(value, ctx, () => valueCommentDone = true, () => chompKeep = true);
      let ws = " ";
      if (keyComment || vsb || vcb) {
        ws = vsb ? "\n" : "";
        if (vcb) {
          const cs = commentString(vcb);
          ws += `
${stringifyComment.indentComment(cs, ctx.indent)}`;
        }
        if (valueStr === "" && !ctx.inFlow) {
          if (ws === "\n" && valueComment)
            ws = "\n\n";
        } else {
          ws += `
${ctx.indent}`;
        }
      } else if (!explicitKey && identity.isCollection(value)) {
        const vs0 = valueStr[0];
        const nl0 = valueStr.indexOf("\n");
        const hasNewline = nl0 !== -1;
        const flow = ctx.inFlow ?? value.flow ?? value.items.length === 0;
        if (hasNewline || !flow) {
          let hasPropsLine = false;
          if (hasNewline && (vs0 === "&" || vs0 === "!")) {
            let sp0 = valueStr.indexOf(" ");
            if (vs0 === "&" && sp0 !== -1 && sp0 < nl0 && valueStr[sp0 + 1] === "!") {
              sp0 = valueStr.indexOf(" ", sp0 + 1);
            }
            if (sp0 === -1 || nl0 < sp0)
              hasPropsLine = true;
          }
          if (!hasPropsLine)
            ws = `
${ctx.indent}`;
        }
      } else if (valueStr === "" || valueStr[0] === "\n") {
        ws = "";
      }
      str += ws + valueStr;
      if (ctx.inFlow) {
        if (valueCommentDone && onComment)
          onComment();
      } else if (valueComment && !valueCommentDone) {
        str += stringifyComment.lineComment(str, ctx.indent, commentString(valueComment));
      } else if (chompKeep && onChompKeep) {
        onChompKeep();
      }
      return str;
    }
    exports.stringifyPair = stringifyPair;
  }
});

// node_modules/yaml/dist/log.js
var require_log = __commonJS({
  "node_modules/yaml/dist/log.js"(exports) {
    "use strict";
    var node_process = __require("process");
    function debug(logLevel, ...messages) {
      if (logLevel === "debug")
        console.log(...messages);
    }
    function warn(logLevel, warning) {
      if (logLevel === "debug" || logLevel === "warn") {
        if (typeof node_process.emitWarning === "function")
          node_process.emitWarning(warning);
        else
          console.warn(warning);
      }
    }
    exports.debug = debug;
    exports.warn = warn;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/merge.js
var require_merge = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/merge.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Scalar = require_Scalar();
    var MERGE_KEY = "<<";
    var merge = {
      identify: (value) => value === MERGE_KEY || typeof value === "symbol" && value.description === MERGE_KEY,
      default: "key",
      tag: "tag:yaml.org,2002:merge",
      test: /^<<$/,
      resolve: () => Object.assign(new Scalar.Scalar(Symbol(MERGE_KEY)), {
        addToJSMap: addMergeToJSMap
      }),
      stringify: () => MERGE_KEY
    };
    var isMergeKey = (ctx, key) => (merge.identify(key) || identity.isScalar(key) && (!key.type || key.type === Scalar.Scalar.PLAIN) && merge.identify(key.value)) && ctx?.doc.schema.tags.some((tag) => tag.tag === merge.tag && tag.default);
    function addMergeToJSMap(ctx, map, value) {
      const source = resolveAliasValue(ctx, value);
      if (identity.isSeq(source))
        for (const it of source.items)
          mergeValue(ctx, map, it);
      else if (Array.isArray(source))
        for (const it of source)
          mergeValue(ctx, map, it);
      else
        mergeValue(ctx, map, source);
    }
    function mergeValue(ctx, map, value) {
      const source = resolveAliasValue(ctx, value);
      if (!identity.isMap(source))
        throw new Error("Merge sources must be maps or map aliases");
      const srcMap = source.toJSON(null, ctx, Map);
      for (const [key, value2] of srcMap) {
        if (map instanceof Map) {
          if (!map.has(key))
            map.set(key, value2);
        } else if (map instanceof Set) {
          map.add(key);
        } else if (!Object.prototype.hasOwnProperty.call(map, key)) {
          Object.defineProperty(map, key, {
            value: value2,
            writable: true,
            enumerable: true,
            configurable: true
          });
        }
      }
      return map;
    }
    function resolveAliasValue(ctx, value) {
      return ctx && identity.isAlias(value) ? value.resolve(ctx.doc, ctx) : value;
    }
    exports.addMergeToJSMap = addMergeToJSMap;
    exports.isMergeKey = isMergeKey;
    exports.merge = merge;
  }
});

// node_modules/yaml/dist/nodes/addPairToJSMap.js
var require_addPairToJSMap = __commonJS({
  "node_modules/yaml/dist/nodes/addPairToJSMap.js"(exports) {
    "use strict";
    var log = require_log();
    var merge = require_merge();
    var stringify = require_stringify();
    var identity = require_identity();
    var toJS = require_toJS();
    function addPairToJSMap(ctx, map, { key, value }) {
      if (identity.isNode(key) && key.addToJSMap)
        key.addToJSMap(ctx, map, value);
      else if (merge.isMergeKey(ctx, key))
        merge.addMergeToJSMap(ctx, map, value);
      else {
        const jsKey = toJS.toJS(key, "", ctx);
        if (map instanceof Map) {
          map.set(jsKey, toJS.toJS(value, jsKey, ctx));
        } else if (map instanceof Set) {
          map.add(jsKey);
        } else {
          const stringKey = stringifyKey(key, jsKey, ctx);
          const jsValue = toJS.toJS(value, stringKey, ctx);
          if (stringKey in map)
            Object.defineProperty(map, stringKey, {
              value: jsValue,
              writable: true,
              enumerable: true,
              configurable: true
            });
          else
            map[stringKey] = jsValue;
        }
      }
      return map;
    }
    function stringifyKey(key, jsKey, ctx) {
      if (jsKey === null)
        return "";
      if (typeof jsKey !== "object")
        return String(jsKey);
      if (identity.isNode(key) && ctx?.doc) {
        const strCtx = stringify.createStringifyContext(ctx.doc, {});
        strCtx.anchors = /* @__PURE__ */ new Set();
        for (const node of ctx.anchors.keys())
          strCtx.anchors.add(node.anchor);
        strCtx.inFlow = true;
        strCtx.inStringifyKey = true;
        const strKey = key.toString(strCtx);
        if (!ctx.mapKeyWarned) {
          let jsonStr = JSON.stringify(strKey);
          if (jsonStr.length > 40)
            jsonStr = jsonStr.substring(0, 36) + '..."';
          log.warn(ctx.doc.options.logLevel, `Keys with collection values will be stringified due to JS Object restrictions: ${jsonStr}. Set mapAsMap: true to use object keys.`);
          ctx.mapKeyWarned = true;
        }
        return strKey;
      }
      return JSON.stringify(jsKey);
    }
    exports.addPairToJSMap = addPairToJSMap;
  }
});

// node_modules/yaml/dist/nodes/Pair.js
var require_Pair = __commonJS({
  "node_modules/yaml/dist/nodes/Pair.js"(exports) {
    "use strict";
    var createNode = require_createNode();
    var stringifyPair = require_stringifyPair();
    var addPairToJSMap = require_addPairToJSMap();
    var identity = require_identity();
    function createPair(key, value, ctx) {
      const k = createNode.createNode(key, void 0, ctx);
      const v = createNode.createNode(value, void 0, ctx);
      return new Pair(k, v);
    }
    var Pair = class _Pair {
      constructor(key, value = null) {
        Object.defineProperty(this, identity.NODE_TYPE, { value: identity.PAIR });
        this.key = key;
        this.value = value;
      }
      clone(schema) {
        let { key, value } = this;
        if (identity.isNode(key))
          key = key.clone(schema);
        if (identity.isNode(value))
          value = value.clone(schema);
        return new _Pair(key, value);
      }
      toJSON(_, ctx) {
        const pair = ctx?.mapAsMap ? /* @__PURE__ */ new Map() : {};
        return addPairToJSMap.addPairToJSMap(ctx, pair, this);
      }
      toString(ctx, onComment, onChompKeep) {
        return ctx?.doc ? stringifyPair.stringifyPair(this, ctx, onComment, onChompKeep) : JSON.stringify(this);
      }
    };
    exports.Pair = Pair;
    exports.createPair = createPair;
  }
});

// node_modules/yaml/dist/stringify/stringifyCollection.js
var require_stringifyCollection = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyCollection.js"(exports) {
    "use strict";
    var identity = require_identity();
    var stringify = require_stringify();
    var stringifyComment = require_stringifyComment();
    function stringifyCollection(collection, ctx, options) {
      const flow = ctx.inFlow ?? collection.flow;
      const stringify2 = flow ? stringifyFlowCollection : stringifyBlockCollection;
      return stringify2(collection, ctx, options);
    }
    function stringifyBlockCollection({ comment, items }, ctx, { blockItemPrefix, flowChars, itemIndent, onChompKeep, onComment }) {
      const { indent, options: { commentString } } = ctx;
      const itemCtx = Object.assign({}, ctx, { indent: itemIndent, type: null });
      let chompKeep = false;
      const lines = [];
      for (let i = 0; i < items.length; ++i) {
        const item = items[i];
        let comment2 = null;
        if (identity.isNode(item)) {
          if (!chompKeep && item.spaceBefore)
            lines.push("");
          addCommentBefore(ctx, lines, item.commentBefore, chompKeep);
          if (item.comment)
            comment2 = item.comment;
        } else if (identity.isPair(item)) {
          const ik = identity.isNode(item.key) ? item.key : null;
          if (ik) {
            if (!chompKeep && ik.spaceBefore)
              lines.push("");
            addCommentBefore(ctx, lines, ik.commentBefore, chompKeep);
          }
        }
        chompKeep = false;
        let str2 = stringify.stringify(item, itemCtx, () => comment2 = null, () => chompKeep = true);
        if (comment2)
          str2 += stringifyComment.lineComment(str2, itemIndent, commentString(comment2));
        if (chompKeep && comment2)
          chompKeep = false;
        lines.push(blockItemPrefix + str2);
      }
      let str;
      if (lines.length === 0) {
        str = flowChars.start + flowChars.end;
      } else {
        str = lines[0];
        for (let i = 1; i < lines.length; ++i) {
          const line = lines[i];
          str += line ? `
${indent}${line}` : "\n";
        }
      }
      if (comment) {
        str += "\n" + stringifyComment.indentComment(commentString(comment), indent);
        if (onComment)
          onComment();
      } else if (chompKeep && onChompKeep)
        onChompKeep();
      return str;
    }
    function stringifyFlowCollection({ items }, ctx, { flowChars, itemIndent }) {
      const { indent, indentStep, flowCollectionPadding: fcPadding, options: { commentString } } = ctx;
      itemIndent += indentStep;
      const itemCtx = Object.assign({}, ctx, {
        indent: itemIndent,
        inFlow: true,
        type: null
      });
      let reqNewline = false;
      let linesAtValue = 0;
      const lines = [];
      for (let i = 0; i < items.length; ++i) {
        const item = items[i];
        let comment = null;
        if (identity.isNode(item)) {
          if (item.spaceBefore)
            lines.push("");
          addCommentBefore(ctx, lines, item.commentBefore, false);
          if (item.comment)
            comment = item.comment;
        } else if (identity.isPair(item)) {
          const ik = identity.isNode(item.key) ? item.key : null;
          if (ik) {
            if (ik.spaceBefore)
              lines.push("");
            addCommentBefore(ctx, lines, ik.commentBefore, false);
            if (ik.comment)
              reqNewline = true;
          }
          const iv = identity.isNode(item.value) ? item.value : null;
          if (iv) {
            if (iv.comment)
              comment = iv.comment;
            if (iv.commentBefore)
              reqNewline = true;
          } else if (item.value == null && ik?.comment) {
            comment = ik.comment;
          }
        }
        if (comment)
          reqNewline = true;
        let str = stringify.stringify(item, itemCtx, () => comment = null);
        reqNewline || (reqNewline = lines.length > linesAtValue || str.includes("\n"));
        if (i < items.length - 1) {
          str += ",";
        } else if (ctx.options.trailingComma) {
          if (ctx.options.lineWidth > 0) {
            reqNewline || (reqNewline = lines.reduce((sum, line) => sum + line.length + 2, 2) + (str.length + 2) > ctx.options.lineWidth);
          }
          if (reqNewline) {
            str += ",";
          }
        }
        if (comment)
          str += stringifyComment.lineComment(str, itemIndent, commentString(comment));
        lines.push(str);
        linesAtValue = lines.length;
      }
      const { start, end } = flowChars;
      if (lines.length === 0) {
        return start + end;
      } else {
        if (!reqNewline) {
          const len = lines.reduce((sum, line) => sum + line.length + 2, 2);
          reqNewline = ctx.options.lineWidth > 0 && len > ctx.options.lineWidth;
        }
        if (reqNewline) {
          let str = start;
          for (const line of lines)
            str += line ? `
${indentStep}${indent}${line}` : "\n";
          return `${str}
${indent}${end}`;
        } else {
          return `${start}${fcPadding}${lines.join(" ")}${fcPadding}${end}`;
        }
      }
    }
    function addCommentBefore({ indent, options: { commentString } }, lines, comment, chompKeep) {
      if (comment && chompKeep)
        comment = comment.replace(/^\n+/, "");
      if (comment) {
        const ic = stringifyComment.indentComment(commentString(comment), indent);
        lines.push(ic.trimStart());
      }
    }
    exports.stringifyCollection = stringifyCollection;
  }
});

// node_modules/yaml/dist/nodes/YAMLMap.js
var require_YAMLMap = __commonJS({
  "node_modules/yaml/dist/nodes/YAMLMap.js"(exports) {
    "use strict";
    var stringifyCollection = require_stringifyCollection();
    var addPairToJSMap = require_addPairToJSMap();
    var Collection = require_Collection();
    var identity = require_identity();
    var Pair = require_Pair();
    var Scalar = require_Scalar();
    function findPair(items, key) {
      const k = identity.isScalar(key) ? key.value : key;
      for (const it of items) {
        if (identity.isPair(it)) {
          if (it.key === key || it.key === k)
            return it;
          if (identity.isScalar(it.key) && it.key.value === k)
            return it;
        }
      }
      return void 0;
    }
    var YAMLMap = class extends Collection.Collection {
      static get tagName() {
        return "tag:yaml.org,2002:map";
      }
      constructor(schema) {
        super(identity.MAP, schema);
        this.items = [];
      }
      /**
       * A generic collection parsing method that can be extended
       * to other node classes that inherit from YAMLMap
       */
      static from(schema, obj, ctx) {
        const { keepUndefined, replacer } = ctx;
        const map = new this(schema);
        const add2 = (key, value) => {
          if (typeof replacer === "function")
            value = replacer.call(obj, key, value);
          else if (Array.isArray(replacer) && !replacer.includes(key))
            return;
          if (value !== void 0 || keepUndefined)
            map.items.push(Pair.createPair(key, value, ctx));
        };
        if (obj instanceof Map) {
          for (const [key, value] of obj)
            add2(key, value);
        } else if (obj && typeof obj === "object") {
          for (const key of Object.keys(obj))
            add2(key, obj[key]);
        }
        if (typeof schema.sortMapEntries === "function") {
          map.items.sort(schema.sortMapEntries);
        }
        return map;
      }
      /**
       * Adds a value to the collection.
       *
       * @param overwrite - If not set `true`, using a key that is already in the
       *   collection will throw. Otherwise, overwrites the previous value.
       */
      add(pair, overwrite) {
        let _pair;
        if (identity.isPair(pair))
          _pair = pair;
        else if (!pair || typeof pair !== "object" || !("key" in pair)) {
          _pair = new Pair.Pair(pair, pair?.value);
        } else
          _pair = new Pair.Pair(pair.key, pair.value);
        const prev = findPair(this.items, _pair.key);
        const sortEntries = this.schema?.sortMapEntries;
        if (prev) {
          if (!overwrite)
            throw new Error(`Key ${_pair.key} already set`);
          if (identity.isScalar(prev.value) && Scalar.isScalarValue(_pair.value))
            prev.value.value = _pair.value;
          else
            prev.value = _pair.value;
        } else if (sortEntries) {
          const i = this.items.findIndex((item) => sortEntries(_pair, item) < 0);
          if (i === -1)
            this.items.push(_pair);
          else
            this.items.splice(i, 0, _pair);
        } else {
          this.items.push(_pair);
        }
      }
      delete(key) {
        const it = findPair(this.items, key);
        if (!it)
          return false;
        const del = this.items.splice(this.items.indexOf(it), 1);
        return del.length > 0;
      }
      get(key, keepScalar) {
        const it = findPair(this.items, key);
        const node = it?.value;
        return (!keepScalar && identity.isScalar(node) ? node.value : node) ?? void 0;
      }
      has(key) {
        return !!findPair(this.items, key);
      }
      set(key, value) {
        this.add(new Pair.Pair(key, value), true);
      }
      /**
       * @param ctx - Conversion context, originally set in Document#toJS()
       * @param {Class} Type - If set, forces the returned collection type
       * @returns Instance of Type, Map, or Object
       */
      toJSON(_, ctx, Type) {
        const map = Type ? new Type() : ctx?.mapAsMap ? /* @__PURE__ */ new Map() : {};
        if (ctx?.onCreate)
          ctx.onCreate(map);
        for (const item of this.items)
          addPairToJSMap.addPairToJSMap(ctx, map, item);
        return map;
      }
      toString(ctx, onComment, onChompKeep) {
        if (!ctx)
          return JSON.stringify(this);
        for (const item of this.items) {
          if (!identity.isPair(item))
            throw new Error(`Map items must all be pairs; found ${JSON.stringify(item)} instead`);
        }
        if (!ctx.allNullValues && this.hasAllNullValues(false))
          ctx = Object.assign({}, ctx, { allNullValues: true });
        return stringifyCollection.stringifyCollection(this, ctx, {
          blockItemPrefix: "",
          flowChars: { start: "{", end: "}" },
          itemIndent: ctx.indent || "",
          onChompKeep,
          onComment
        });
      }
    };
    exports.YAMLMap = YAMLMap;
    exports.findPair = findPair;
  }
});

// node_modules/yaml/dist/schema/common/map.js
var require_map = __commonJS({
  "node_modules/yaml/dist/schema/common/map.js"(exports) {
    "use strict";
    var identity = require_identity();
    var YAMLMap = require_YAMLMap();
    var map = {
      collection: "map",
      default: true,
      nodeClass: YAMLMap.YAMLMap,
      tag: "tag:yaml.org,2002:map",
      resolve(map2, onError) {
        if (!identity.isMap(map2))
          onError("Expected a mapping for this tag");
        return map2;
      },
      createNode: (schema, obj, ctx) => YAMLMap.YAMLMap.from(schema, obj, ctx)
    };
    exports.map = map;
  }
});

// node_modules/yaml/dist/nodes/YAMLSeq.js
var require_YAMLSeq = __commonJS({
  "node_modules/yaml/dist/nodes/YAMLSeq.js"(exports) {
    "use strict";
    var createNode = require_createNode();
    var stringifyCollection = require_stringifyCollection();
    var Collection = require_Collection();
    var identity = require_identity();
    var Scalar = require_Scalar();
    var toJS = require_toJS();
    var YAMLSeq = class extends Collection.Collection {
      static get tagName() {
        return "tag:yaml.org,2002:seq";
      }
      constructor(schema) {
        super(identity.SEQ, schema);
        this.items = [];
      }
      add(value) {
        this.items.push(value);
      }
      /**
       * Removes a value from the collection.
       *
       * `key` must contain a representation of an integer for this to succeed.
       * It may be wrapped in a `Scalar`.
       *
       * @returns `true` if the item was found and removed.
       */
      delete(key) {
        const idx = asItemIndex(key);
        if (typeof idx !== "number")
          return false;
        const del = this.items.splice(idx, 1);
        return del.length > 0;
      }
      get(key, keepScalar) {
        const idx = asItemIndex(key);
        if (typeof idx !== "number")
          return void 0;
        const it = this.items[idx];
        return !keepScalar && identity.isScalar(it) ? it.value : it;
      }
      /**
       * Checks if the collection includes a value with the key `key`.
       *
       * `key` must contain a representation of an integer for this to succeed.
       * It may be wrapped in a `Scalar`.
       */
      has(key) {
        const idx = asItemIndex(key);
        return typeof idx === "number" && idx < this.items.length;
      }
      /**
       * Sets a value in this collection. For `!!set`, `value` needs to be a
       * boolean to add/remove the item from the set.
       *
       * If `key` does not contain a representation of an integer, this will throw.
       * It may be wrapped in a `Scalar`.
       */
      set(key, value) {
        const idx = asItemIndex(key);
        if (typeof idx !== "number")
          throw new Error(`Expected a valid index, not ${key}.`);
        const prev = this.items[idx];
        if (identity.isScalar(prev) && Scalar.isScalarValue(value))
          prev.value = value;
        else
          this.items[idx] = value;
      }
      toJSON(_, ctx) {
        const seq = [];
        if (ctx?.onCreate)
          ctx.onCreate(seq);
        let i = 0;
        for (const item of this.items)
          seq.push(toJS.toJS(item, String(i++), ctx));
        return seq;
      }
      toString(ctx, onComment, onChompKeep) {
        if (!ctx)
          return JSON.stringify(this);
        return stringifyCollection.stringifyCollection(this, ctx, {
          blockItemPrefix: "- ",
          flowChars: { start: "[", end: "]" },
          itemIndent: (ctx.indent || "") + "  ",
          onChompKeep,
          onComment
        });
      }
      static from(schema, obj, ctx) {
        const { replacer } = ctx;
        const seq = new this(schema);
        if (obj && Symbol.iterator in Object(obj)) {
          let i = 0;
          for (let it of obj) {
            if (typeof replacer === "function") {
              const key = obj instanceof Set ? it : String(i++);
              it = replacer.call(obj, key, it);
            }
            seq.items.push(createNode.createNode(it, void 0, ctx));
          }
        }
        return seq;
      }
    };
    function asItemIndex(key) {
      let idx = identity.isScalar(key) ? key.value : key;
      if (idx && typeof idx === "string")
        idx = Number(idx);
      return typeof idx === "number" && Number.isInteger(idx) && idx >= 0 ? idx : null;
    }
    exports.YAMLSeq = YAMLSeq;
  }
});

// node_modules/yaml/dist/schema/common/seq.js
var require_seq = __commonJS({
  "node_modules/yaml/dist/schema/common/seq.js"(exports) {
    "use strict";
    var identity = require_identity();
    var YAMLSeq = require_YAMLSeq();
    var seq = {
      collection: "seq",
      default: true,
      nodeClass: YAMLSeq.YAMLSeq,
      tag: "tag:yaml.org,2002:seq",
      resolve(seq2, onError) {
        if (!identity.isSeq(seq2))
          onError("Expected a sequence for this tag");
        return seq2;
      },
      createNode: (schema, obj, ctx) => YAMLSeq.YAMLSeq.from(schema, obj, ctx)
    };
    exports.seq = seq;
  }
});

// node_modules/yaml/dist/schema/common/string.js
var require_string = __commonJS({
  "node_modules/yaml/dist/schema/common/string.js"(exports) {
    "use strict";
    var stringifyString = require_stringifyString();
    var string = {
      identify: (value) => typeof value === "string",
      default: true,
      tag: "tag:yaml.org,2002:str",
      resolve: (str) => str,
      stringify(item, ctx, onComment, onChompKeep) {
        ctx = Object.assign({ actualString: true }, ctx);
        return stringifyString.stringifyString(item, ctx, onComment, onChompKeep);
      }
    };
    exports.string = string;
  }
});

// node_modules/yaml/dist/schema/common/null.js
var require_null = __commonJS({
  "node_modules/yaml/dist/schema/common/null.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var nullTag = {
      identify: (value) => value == null,
      createNode: () => new Scalar.Scalar(null),
      default: true,
      tag: "tag:yaml.org,2002:null",
      test: /^(?:~|[Nn]ull|NULL)?$/,
      resolve: () => new Scalar.Scalar(null),
      stringify: ({ source }, ctx) => typeof source === "string" && nullTag.test.test(source) ? source : ctx.options.nullStr
    };
    exports.nullTag = nullTag;
  }
});

// node_modules/yaml/dist/schema/core/bool.js
var require_bool = __commonJS({
  "node_modules/yaml/dist/schema/core/bool.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var boolTag = {
      identify: (value) => typeof value === "boolean",
      default: true,
      tag: "tag:yaml.org,2002:bool",
      test: /^(?:[Tt]rue|TRUE|[Ff]alse|FALSE)$/,
      resolve: (str) => new Scalar.Scalar(str[0] === "t" || str[0] === "T"),
      stringify({ source, value }, ctx) {
        if (source && boolTag.test.test(source)) {
          const sv = source[0] === "t" || source[0] === "T";
          if (value === sv)
            return source;
        }
        return value ? ctx.options.trueStr : ctx.options.falseStr;
      }
    };
    exports.boolTag = boolTag;
  }
});

// node_modules/yaml/dist/stringify/stringifyNumber.js
var require_stringifyNumber = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyNumber.js"(exports) {
    "use strict";
    function stringifyNumber({ format, minFractionDigits, tag, value }) {
      if (typeof value === "bigint")
        return String(value);
      const num = typeof value === "number" ? value : Number(value);
      if (!isFinite(num))
        return isNaN(num) ? ".nan" : num < 0 ? "-.inf" : ".inf";
      let n = Object.is(value, -0) ? "-0" : JSON.stringify(value);
      if (!format && minFractionDigits && (!tag || tag === "tag:yaml.org,2002:float") && /^-?\d/.test(n) && !n.includes("e")) {
        let i = n.indexOf(".");
        if (i < 0) {
          i = n.length;
          n += ".";
        }
        let d = minFractionDigits - (n.length - i - 1);
        while (d-- > 0)
          n += "0";
      }
      return n;
    }
    exports.stringifyNumber = stringifyNumber;
  }
});

// node_modules/yaml/dist/schema/core/float.js
var require_float = __commonJS({
  "node_modules/yaml/dist/schema/core/float.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var stringifyNumber = require_stringifyNumber();
    var floatNaN = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      test: /^(?:[-+]?\.(?:inf|Inf|INF)|\.nan|\.NaN|\.NAN)$/,
      resolve: (str) => str.slice(-3).toLowerCase() === "nan" ? NaN : str[0] === "-" ? Number.NEGATIVE_INFINITY : Number.POSITIVE_INFINITY,
      stringify: stringifyNumber.stringifyNumber
    };
    var floatExp = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      format: "EXP",
      test: /^[-+]?(?:\.[0-9]+|[0-9]+(?:\.[0-9]*)?)[eE][-+]?[0-9]+$/,
      resolve: (str) => parseFloat(str),
      stringify(node) {
        const num = Number(node.value);
        return isFinite(num) ? num.toExponential() : stringifyNumber.stringifyNumber(node);
      }
    };
    var float = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      test: /^[-+]?(?:\.[0-9]+|[0-9]+\.[0-9]*)$/,
      resolve(str) {
        const node = new Scalar.Scalar(parseFloat(str));
        const dot = str.indexOf(".");
        if (dot !== -1 && str[str.length - 1] === "0")
          node.minFractionDigits = str.length - dot - 1;
        return node;
      },
      stringify: stringifyNumber.stringifyNumber
    };
    exports.float = float;
    exports.floatExp = floatExp;
    exports.floatNaN = floatNaN;
  }
});

// node_modules/yaml/dist/schema/core/int.js
var require_int = __commonJS({
  "node_modules/yaml/dist/schema/core/int.js"(exports) {
    "use strict";
    var stringifyNumber = require_stringifyNumber();
    var intIdentify = (value) => typeof value === "bigint" || Number.isInteger(value);
    var intResolve = (str, offset, radix, { intAsBigInt }) => intAsBigInt ? BigInt(str) : parseInt(str.substring(offset), radix);
    function intStringify(node, radix, prefix) {
      const { value } = node;
      if (intIdentify(value) && value >= 0)
        return prefix + value.toString(radix);
      return stringifyNumber.stringifyNumber(node);
    }
    var intOct = {
      identify: (value) => intIdentify(value) && value >= 0,
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "OCT",
      test: /^0o[0-7]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 2, 8, opt),
      stringify: (node) => intStringify(node, 8, "0o")
    };
    var int = {
      identify: intIdentify,
      default: true,
      tag: "tag:yaml.org,2002:int",
      test: /^[-+]?[0-9]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 0, 10, opt),
      stringify: stringifyNumber.stringifyNumber
    };
    var intHex = {
      identify: (value) => intIdentify(value) && value >= 0,
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "HEX",
      test: /^0x[0-9a-fA-F]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 2, 16, opt),
      stringify: (node) => intStringify(node, 16, "0x")
    };
    exports.int = int;
    exports.intHex = intHex;
    exports.intOct = intOct;
  }
});

// node_modules/yaml/dist/schema/core/schema.js
var require_schema = __commonJS({
  "node_modules/yaml/dist/schema/core/schema.js"(exports) {
    "use strict";
    var map = require_map();
    var _null = require_null();
    var seq = require_seq();
    var string = require_string();
    var bool = require_bool();
    var float = require_float();
    var int = require_int();
    var schema = [
      map.map,
      seq.seq,
      string.string,
      _null.nullTag,
      bool.boolTag,
      int.intOct,
      int.int,
      int.intHex,
      float.floatNaN,
      float.floatExp,
      float.float
    ];
    exports.schema = schema;
  }
});

// node_modules/yaml/dist/schema/json/schema.js
var require_schema2 = __commonJS({
  "node_modules/yaml/dist/schema/json/schema.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var map = require_map();
    var seq = require_seq();
    function intIdentify(value) {
      return typeof value === "bigint" || Number.isInteger(value);
    }
    var stringifyJSON = ({ value }) => JSON.stringify(value);
    var jsonScalars = [
      {
        identify: (value) => typeof value === "string",
        default: true,
        tag: "tag:yaml.org,2002:str",
        resolve: (str) => str,
        stringify: stringifyJSON
      },
      {
        identify: (value) => value == null,
        createNode: () => new Scalar.Scalar(null),
        default: true,
        tag: "tag:yaml.org,2002:null",
        test: /^null$/,
        resolve: () => null,
        stringify: stringifyJSON
      },
      {
        identify: (value) => typeof value === "boolean",
        default: true,
        tag: "tag:yaml.org,2002:bool",
        test: /^true$|^false$/,
        resolve: (str) => str === "true",
        stringify: stringifyJSON
      },
      {
        identify: intIdentify,
        default: true,
        tag: "tag:yaml.org,2002:int",
        test: /^-?(?:0|[1-9][0-9]*)$/,
        resolve: (str, _onError, { intAsBigInt }) => intAsBigInt ? BigInt(str) : parseInt(str, 10),
        stringify: ({ value }) => intIdentify(value) ? value.toString() : JSON.stringify(value)
      },
      {
        identify: (value) => typeof value === "number",
        default: true,
        tag: "tag:yaml.org,2002:float",
        test: /^-?(?:0|[1-9][0-9]*)(?:\.[0-9]*)?(?:[eE][-+]?[0-9]+)?$/,
        resolve: (str) => parseFloat(str),
        stringify: stringifyJSON
      }
    ];
    var jsonError = {
      default: true,
      tag: "",
      test: /^/,
      resolve(str, onError) {
        onError(`Unresolved plain scalar ${JSON.stringify(str)}`);
        return str;
      }
    };
    var schema = [map.map, seq.seq].concat(jsonScalars, jsonError);
    exports.schema = schema;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/binary.js
var require_binary = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/binary.js"(exports) {
    "use strict";
    var node_buffer = __require("buffer");
    var Scalar = require_Scalar();
    var stringifyString = require_stringifyString();
    var binary = {
      identify: (value) => value instanceof Uint8Array,
      // Buffer inherits from Uint8Array
      default: false,
      tag: "tag:yaml.org,2002:binary",
      /**
       * Returns a Buffer in node and an Uint8Array in browsers
       *
       * To use the resulting buffer as an image, you'll want to do something like:
       *
       *   const blob = new Blob([buffer], { type: 'image/jpeg' })
       *   document.querySelector('#photo').src = URL.createObjectURL(blob)
       */
      resolve(src, onError) {
        if (typeof node_buffer.Buffer === "function") {
          return node_buffer.Buffer.from(src, "base64");
        } else if (typeof atob === "function") {
          const str = atob(src.replace(/[\n\r]/g, ""));
          const buffer = new Uint8Array(str.length);
          for (let i = 0; i < str.length; ++i)
            buffer[i] = str.charCodeAt(i);
          return buffer;
        } else {
          onError("This environment does not support reading binary tags; either Buffer or atob is required");
          return src;
        }
      },
      stringify({ comment, type, value }, ctx, onComment, onChompKeep) {
        if (!value)
          return "";
        const buf = value;
        let str;
        if (typeof node_buffer.Buffer === "function") {
          str = buf instanceof node_buffer.Buffer ? buf.toString("base64") : node_buffer.Buffer.from(buf.buffer).toString("base64");
        } else if (typeof btoa === "function") {
          let s = "";
          for (let i = 0; i < buf.length; ++i)
            s += String.fromCharCode(buf[i]);
          str = btoa(s);
        } else {
          throw new Error("This environment does not support writing binary tags; either Buffer or btoa is required");
        }
        type ?? (type = Scalar.Scalar.BLOCK_LITERAL);
        if (type !== Scalar.Scalar.QUOTE_DOUBLE) {
          const lineWidth = Math.max(ctx.options.lineWidth - ctx.indent.length, ctx.options.minContentWidth);
          const n = Math.ceil(str.length / lineWidth);
          const lines = new Array(n);
          for (let i = 0, o = 0; i < n; ++i, o += lineWidth) {
            lines[i] = str.substr(o, lineWidth);
          }
          str = lines.join(type === Scalar.Scalar.BLOCK_LITERAL ? "\n" : " ");
        }
        return stringifyString.stringifyString({ comment, type, value: str }, ctx, onComment, onChompKeep);
      }
    };
    exports.binary = binary;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/pairs.js
var require_pairs = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/pairs.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Pair = require_Pair();
    var Scalar = require_Scalar();
    var YAMLSeq = require_YAMLSeq();
    function resolvePairs(seq, onError) {
      if (identity.isSeq(seq)) {
        for (let i = 0; i < seq.items.length; ++i) {
          let item = seq.items[i];
          if (identity.isPair(item))
            continue;
          else if (identity.isMap(item)) {
            if (item.items.length > 1)
              onError("Each pair must have its own sequence indicator");
            const pair = item.items[0] || new Pair.Pair(new Scalar.Scalar(null));
            if (item.commentBefore)
              pair.key.commentBefore = pair.key.commentBefore ? `${item.commentBefore}
${pair.key.commentBefore}` : item.commentBefore;
            if (item.comment) {
              const cn = pair.value ?? pair.key;
              cn.comment = cn.comment ? `${item.comment}
${cn.comment}` : item.comment;
            }
            item = pair;
          }
          seq.items[i] = identity.isPair(item) ? item : new Pair.Pair(item);
        }
      } else
        onError("Expected a sequence for this tag");
      return seq;
    }
    function createPairs(schema, iterable, ctx) {
      const { replacer } = ctx;
      const pairs2 = new YAMLSeq.YAMLSeq(schema);
      pairs2.tag = "tag:yaml.org,2002:pairs";
      let i = 0;
      if (iterable && Symbol.iterator in Object(iterable))
        for (let it of iterable) {
          if (typeof replacer === "function")
            it = replacer.call(iterable, String(i++), it);
          let key, value;
          if (Array.isArray(it)) {
            if (it.length === 2) {
              key = it[0];
              value = it[1];
            } else
              throw new TypeError(`Expected [key, value] tuple: ${it}`);
          } else if (it && it instanceof Object) {
            const keys = Object.keys(it);
            if (keys.length === 1) {
              key = keys[0];
              value = it[key];
            } else {
              throw new TypeError(`Expected tuple with one key, not ${keys.length} keys`);
            }
          } else {
            key = it;
          }
          pairs2.items.push(Pair.createPair(key, value, ctx));
        }
      return pairs2;
    }
    var pairs = {
      collection: "seq",
      default: false,
      tag: "tag:yaml.org,2002:pairs",
      resolve: resolvePairs,
      createNode: createPairs
    };
    exports.createPairs = createPairs;
    exports.pairs = pairs;
    exports.resolvePairs = resolvePairs;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/omap.js
var require_omap = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/omap.js"(exports) {
    "use strict";
    var identity = require_identity();
    var toJS = require_toJS();
    var YAMLMap = require_YAMLMap();
    var YAMLSeq = require_YAMLSeq();
    var pairs = require_pairs();
    var YAMLOMap = class _YAMLOMap extends YAMLSeq.YAMLSeq {
      constructor() {
        super();
        this.add = YAMLMap.YAMLMap.prototype.add.bind(this);
        this.delete = YAMLMap.YAMLMap.prototype.delete.bind(this);
        this.get = YAMLMap.YAMLMap.prototype.get.bind(this);
        this.has = YAMLMap.YAMLMap.prototype.has.bind(this);
        this.set = YAMLMap.YAMLMap.prototype.set.bind(this);
        this.tag = _YAMLOMap.tag;
      }
      /**
       * If `ctx` is given, the return type is actually `Map<unknown, unknown>`,
       * but TypeScript won't allow widening the signature of a child method.
       */
      toJSON(_, ctx) {
        if (!ctx)
          return super.toJSON(_);
        const map = /* @__PURE__ */ new Map();
        if (ctx?.onCreate)
          ctx.onCreate(map);
        for (const pair of this.items) {
          let key, value;
          if (identity.isPair(pair)) {
            key = toJS.toJS(pair.key, "", ctx);
            value = toJS.toJS(pair.value, key, ctx);
          } else {
            key = toJS.toJS(pair, "", ctx);
          }
          if (map.has(key))
            throw new Error("Ordered maps must not include duplicate keys");
          map.set(key, value);
        }
        return map;
      }
      static from(schema, iterable, ctx) {
        const pairs$1 = pairs.createPairs(schema, iterable, ctx);
        const omap2 = new this();
        omap2.items = pairs$1.items;
        return omap2;
      }
    };
    YAMLOMap.tag = "tag:yaml.org,2002:omap";
    var omap = {
      collection: "seq",
      identify: (value) => value instanceof Map,
      nodeClass: YAMLOMap,
      default: false,
      tag: "tag:yaml.org,2002:omap",
      resolve(seq, onError) {
        const pairs$1 = pairs.resolvePairs(seq, onError);
        const seenKeys = [];
        for (const { key } of pairs$1.items) {
          if (identity.isScalar(key)) {
            if (seenKeys.includes(key.value)) {
              onError(`Ordered maps must not include duplicate keys: ${key.value}`);
            } else {
              seenKeys.push(key.value);
            }
          }
        }
        return Object.assign(new YAMLOMap(), pairs$1);
      },
      createNode: (schema, iterable, ctx) => YAMLOMap.from(schema, iterable, ctx)
    };
    exports.YAMLOMap = YAMLOMap;
    exports.omap = omap;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/bool.js
var require_bool2 = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/bool.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    function boolStringify({ value, source }, ctx) {
      const boolObj = value ? trueTag : falseTag;
      if (source && boolObj.test.test(source))
        return source;
      return value ? ctx.options.trueStr : ctx.options.falseStr;
    }
    var trueTag = {
      identify: (value) => value === true,
      default: true,
      tag: "tag:yaml.org,2002:bool",
      test: /^(?:Y|y|[Yy]es|YES|[Tt]rue|TRUE|[Oo]n|ON)$/,
      resolve: () => new Scalar.Scalar(true),
      stringify: boolStringify
    };
    var falseTag = {
      identify: (value) => value === false,
      default: true,
      tag: "tag:yaml.org,2002:bool",
      test: /^(?:N|n|[Nn]o|NO|[Ff]alse|FALSE|[Oo]ff|OFF)$/,
      resolve: () => new Scalar.Scalar(false),
      stringify: boolStringify
    };
    exports.falseTag = falseTag;
    exports.trueTag = trueTag;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/float.js
var require_float2 = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/float.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var stringifyNumber = require_stringifyNumber();
    var floatNaN = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      test: /^(?:[-+]?\.(?:inf|Inf|INF)|\.nan|\.NaN|\.NAN)$/,
      resolve: (str) => str.slice(-3).toLowerCase() === "nan" ? NaN : str[0] === "-" ? Number.NEGATIVE_INFINITY : Number.POSITIVE_INFINITY,
      stringify: stringifyNumber.stringifyNumber
    };
    var floatExp = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      format: "EXP",
      test: /^[-+]?(?:[0-9][0-9_]*)?(?:\.[0-9_]*)?[eE][-+]?[0-9]+$/,
      resolve: (str) => parseFloat(str.replace(/_/g, "")),
      stringify(node) {
        const num = Number(node.value);
        return isFinite(num) ? num.toExponential() : stringifyNumber.stringifyNumber(node);
      }
    };
    var float = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      test: /^[-+]?(?:[0-9][0-9_]*)?\.[0-9_]*$/,
      resolve(str) {
        const node = new Scalar.Scalar(parseFloat(str.replace(/_/g, "")));
        const dot = str.indexOf(".");
        if (dot !== -1) {
          const f2 = str.substring(dot + 1).replace(/_/g, "");
          if (f2[f2.length - 1] === "0")
            node.minFractionDigits = f2.length;
        }
        return node;
      },
      stringify: stringifyNumber.stringifyNumber
    };
    exports.float = float;
    exports.floatExp = floatExp;
    exports.floatNaN = floatNaN;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/int.js
var require_int2 = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/int.js"(exports) {
    "use strict";
    var stringifyNumber = require_stringifyNumber();
    var intIdentify = (value) => typeof value === "bigint" || Number.isInteger(value);
    function intResolve(str, offset, radix, { intAsBigInt }) {
      const sign2 = str[0];
      if (sign2 === "-" || sign2 === "+")
        offset += 1;
      str = str.substring(offset).replace(/_/g, "");
      if (intAsBigInt) {
        switch (radix) {
          case 2:
            str = `0b${str}`;
            break;
          case 8:
            str = `0o${str}`;
            break;
          case 16:
            str = `0x${str}`;
            break;
        }
        const n2 = BigInt(str);
        return sign2 === "-" ? BigInt(-1) * n2 : n2;
      }
      const n = parseInt(str, radix);
      return sign2 === "-" ? -1 * n : n;
    }
    function intStringify(node, radix, prefix) {
      const { value } = node;
      if (intIdentify(value)) {
        const str = value.toString(radix);
        return value < 0 ? "-" + prefix + str.substr(1) : prefix + str;
      }
      return stringifyNumber.stringifyNumber(node);
    }
    var intBin = {
      identify: intIdentify,
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "BIN",
      test: /^[-+]?0b[0-1_]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 2, 2, opt),
      stringify: (node) => intStringify(node, 2, "0b")
    };
    var intOct = {
      identify: intIdentify,
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "OCT",
      test: /^[-+]?0[0-7_]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 1, 8, opt),
      stringify: (node) => intStringify(node, 8, "0")
    };
    var int = {
      identify: intIdentify,
      default: true,
      tag: "tag:yaml.org,2002:int",
      test: /^[-+]?[0-9][0-9_]*$/,
      resolve: (str, _onError, opt) => intResolve(str, 0, 10, opt),
      stringify: stringifyNumber.stringifyNumber
    };
    var intHex = {
      identify: intIdentify,
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "HEX",
      test: /^[-+]?0x[0-9a-fA-F_]+$/,
      resolve: (str, _onError, opt) => intResolve(str, 2, 16, opt),
      stringify: (node) => intStringify(node, 16, "0x")
    };
    exports.int = int;
    exports.intBin = intBin;
    exports.intHex = intHex;
    exports.intOct = intOct;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/set.js
var require_set = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/set.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Pair = require_Pair();
    var YAMLMap = require_YAMLMap();
    var YAMLSet = class _YAMLSet extends YAMLMap.YAMLMap {
      constructor(schema) {
        super(schema);
        this.tag = _YAMLSet.tag;
      }
      add(key) {
        let pair;
        if (identity.isPair(key))
          pair = key;
        else if (key && typeof key === "object" && "key" in key && "value" in key && key.value === null)
          pair = new Pair.Pair(key.key, null);
        else
          pair = new Pair.Pair(key, null);
        const prev = YAMLMap.findPair(this.items, pair.key);
        if (!prev)
          this.items.push(pair);
      }
      /**
       * If `keepPair` is `true`, returns the Pair matching `key`.
       * Otherwise, returns the value of that Pair's key.
       */
      get(key, keepPair) {
        const pair = YAMLMap.findPair(this.items, key);
        return !keepPair && identity.isPair(pair) ? identity.isScalar(pair.key) ? pair.key.value : pair.key : pair;
      }
      set(key, value) {
        if (typeof value !== "boolean")
          throw new Error(`Expected boolean value for set(key, value) in a YAML set, not ${typeof value}`);
        const prev = YAMLMap.findPair(this.items, key);
        if (prev && !value) {
          this.items.splice(this.items.indexOf(prev), 1);
        } else if (!prev && value) {
          this.items.push(new Pair.Pair(key));
        }
      }
      toJSON(_, ctx) {
        return super.toJSON(_, ctx, Set);
      }
      toString(ctx, onComment, onChompKeep) {
        if (!ctx)
          return JSON.stringify(this);
        if (this.hasAllNullValues(true))
          return super.toString(Object.assign({}, ctx, { allNullValues: true }), onComment, onChompKeep);
        else
          throw new Error("Set items must all have null values");
      }
      static from(schema, iterable, ctx) {
        const { replacer } = ctx;
        const set2 = new this(schema);
        if (iterable && Symbol.iterator in Object(iterable))
          for (let value of iterable) {
            if (typeof replacer === "function")
              value = replacer.call(iterable, value, value);
            set2.items.push(Pair.createPair(value, null, ctx));
          }
        return set2;
      }
    };
    YAMLSet.tag = "tag:yaml.org,2002:set";
    var set = {
      collection: "map",
      identify: (value) => value instanceof Set,
      nodeClass: YAMLSet,
      default: false,
      tag: "tag:yaml.org,2002:set",
      createNode: (schema, iterable, ctx) => YAMLSet.from(schema, iterable, ctx),
      resolve(map, onError) {
        if (identity.isMap(map)) {
          if (map.hasAllNullValues(true))
            return Object.assign(new YAMLSet(), map);
          else
            onError("Set items must all have null values");
        } else
          onError("Expected a mapping for this tag");
        return map;
      }
    };
    exports.YAMLSet = YAMLSet;
    exports.set = set;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/timestamp.js
var require_timestamp = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/timestamp.js"(exports) {
    "use strict";
    var stringifyNumber = require_stringifyNumber();
    function parseSexagesimal(str, asBigInt) {
      const sign2 = str[0];
      const parts = sign2 === "-" || sign2 === "+" ? str.substring(1) : str;
      const num = (n) => asBigInt ? BigInt(n) : Number(n);
      const res = parts.replace(/_/g, "").split(":").reduce((res2, p) => res2 * num(60) + num(p), num(0));
      return sign2 === "-" ? num(-1) * res : res;
    }
    function stringifySexagesimal(node) {
      let { value } = node;
      let num = (n) => n;
      if (typeof value === "bigint")
        num = (n) => BigInt(n);
      else if (isNaN(value) || !isFinite(value))
        return stringifyNumber.stringifyNumber(node);
      let sign2 = "";
      if (value < 0) {
        sign2 = "-";
        value *= num(-1);
      }
      const _60 = num(60);
      const parts = [value % _60];
      if (value < 60) {
        parts.unshift(0);
      } else {
        value = (value - parts[0]) / _60;
        parts.unshift(value % _60);
        if (value >= 60) {
          value = (value - parts[0]) / _60;
          parts.unshift(value);
        }
      }
      return sign2 + parts.map((n) => String(n).padStart(2, "0")).join(":").replace(/000000\d*$/, "");
    }
    var intTime = {
      identify: (value) => typeof value === "bigint" || Number.isInteger(value),
      default: true,
      tag: "tag:yaml.org,2002:int",
      format: "TIME",
      test: /^[-+]?[0-9][0-9_]*(?::[0-5]?[0-9])+$/,
      resolve: (str, _onError, { intAsBigInt }) => parseSexagesimal(str, intAsBigInt),
      stringify: stringifySexagesimal
    };
    var floatTime = {
      identify: (value) => typeof value === "number",
      default: true,
      tag: "tag:yaml.org,2002:float",
      format: "TIME",
      test: /^[-+]?[0-9][0-9_]*(?::[0-5]?[0-9])+\.[0-9_]*$/,
      resolve: (str) => parseSexagesimal(str, false),
      stringify: stringifySexagesimal
    };
    var timestamp = {
      identify: (value) => value instanceof Date,
      default: true,
      tag: "tag:yaml.org,2002:timestamp",
      // If the time zone is omitted, the timestamp is assumed to be specified in UTC. The time part
      // may be omitted altogether, resulting in a date format. In such a case, the time part is
      // assumed to be 00:00:00Z (start of day, UTC).
      test: RegExp("^([0-9]{4})-([0-9]{1,2})-([0-9]{1,2})(?:(?:t|T|[ \\t]+)([0-9]{1,2}):([0-9]{1,2}):([0-9]{1,2}(\\.[0-9]+)?)(?:[ \\t]*(Z|[-+][012]?[0-9](?::[0-9]{2})?))?)?$"),
      resolve(str) {
        const match = str.match(timestamp.test);
        if (!match)
          throw new Error("!!timestamp expects a date, starting with yyyy-mm-dd");
        const [, year, month, day, hour, minute, second] = match.map(Number);
        const millisec = match[7] ? Number((match[7] + "00").substr(1, 3)) : 0;
        let date = Date.UTC(year, month - 1, day, hour || 0, minute || 0, second || 0, millisec);
        const tz = match[8];
        if (tz && tz !== "Z") {
          let d = parseSexagesimal(tz, false);
          if (Math.abs(d) < 30)
            d *= 60;
          date -= 6e4 * d;
        }
        return new Date(date);
      },
      stringify: ({ value }) => value?.toISOString().replace(/(T00:00:00)?\.000Z$/, "") ?? ""
    };
    exports.floatTime = floatTime;
    exports.intTime = intTime;
    exports.timestamp = timestamp;
  }
});

// node_modules/yaml/dist/schema/yaml-1.1/schema.js
var require_schema3 = __commonJS({
  "node_modules/yaml/dist/schema/yaml-1.1/schema.js"(exports) {
    "use strict";
    var map = require_map();
    var _null = require_null();
    var seq = require_seq();
    var string = require_string();
    var binary = require_binary();
    var bool = require_bool2();
    var float = require_float2();
    var int = require_int2();
    var merge = require_merge();
    var omap = require_omap();
    var pairs = require_pairs();
    var set = require_set();
    var timestamp = require_timestamp();
    var schema = [
      map.map,
      seq.seq,
      string.string,
      _null.nullTag,
      bool.trueTag,
      bool.falseTag,
      int.intBin,
      int.intOct,
      int.int,
      int.intHex,
      float.floatNaN,
      float.floatExp,
      float.float,
      binary.binary,
      merge.merge,
      omap.omap,
      pairs.pairs,
      set.set,
      timestamp.intTime,
      timestamp.floatTime,
      timestamp.timestamp
    ];
    exports.schema = schema;
  }
});

// node_modules/yaml/dist/schema/tags.js
var require_tags = __commonJS({
  "node_modules/yaml/dist/schema/tags.js"(exports) {
    "use strict";
    var map = require_map();
    var _null = require_null();
    var seq = require_seq();
    var string = require_string();
    var bool = require_bool();
    var float = require_float();
    var int = require_int();
    var schema = require_schema();
    var schema$1 = require_schema2();
    var binary = require_binary();
    var merge = require_merge();
    var omap = require_omap();
    var pairs = require_pairs();
    var schema$2 = require_schema3();
    var set = require_set();
    var timestamp = require_timestamp();
    var schemas = /* @__PURE__ */ new Map([
      ["core", schema.schema],
      ["failsafe", [map.map, seq.seq, string.string]],
      ["json", schema$1.schema],
      ["yaml11", schema$2.schema],
      ["yaml-1.1", schema$2.schema]
    ]);
    var tagsByName = {
      binary: binary.binary,
      bool: bool.boolTag,
      float: float.float,
      floatExp: float.floatExp,
      floatNaN: float.floatNaN,
      floatTime: timestamp.floatTime,
      int: int.int,
      intHex: int.intHex,
      intOct: int.intOct,
      intTime: timestamp.intTime,
      map: map.map,
      merge: merge.merge,
      null: _null.nullTag,
      omap: omap.omap,
      pairs: pairs.pairs,
      seq: seq.seq,
      set: set.set,
      timestamp: timestamp.timestamp
    };
    var coreKnownTags = {
      "tag:yaml.org,2002:binary": binary.binary,
      "tag:yaml.org,2002:merge": merge.merge,
      "tag:yaml.org,2002:omap": omap.omap,
      "tag:yaml.org,2002:pairs": pairs.pairs,
      "tag:yaml.org,2002:set": set.set,
      "tag:yaml.org,2002:timestamp": timestamp.timestamp
    };
    function getTags(customTags, schemaName, addMergeTag) {
      const schemaTags = schemas.get(schemaName);
      if (schemaTags && !customTags) {
        return addMergeTag && !schemaTags.includes(merge.merge) ? schemaTags.concat(merge.merge) : schemaTags.slice();
      }
      let tags = schemaTags;
      if (!tags) {
        if (Array.isArray(customTags))
          tags = [];
        else {
          const keys = Array.from(schemas.keys()).filter((key) => key !== "yaml11").map((key) => JSON.stringify(key)).join(", ");
          throw new Error(`Unknown schema "${schemaName}"; use one of ${keys} or define customTags array`);
        }
      }
      if (Array.isArray(customTags)) {
        for (const tag of customTags)
          tags = tags.concat(tag);
      } else if (typeof customTags === "function") {
        tags = customTags(tags.slice());
      }
      if (addMergeTag)
        tags = tags.concat(merge.merge);
      return tags.reduce((tags2, tag) => {
        const tagObj = typeof tag === "string" ? tagsByName[tag] : tag;
        if (!tagObj) {
          const tagName = JSON.stringify(tag);
          const keys = Object.keys(tagsByName).map((key) => JSON.stringify(key)).join(", ");
          throw new Error(`Unknown custom tag ${tagName}; use one of ${keys}`);
        }
        if (!tags2.includes(tagObj))
          tags2.push(tagObj);
        return tags2;
      }, []);
    }
    exports.coreKnownTags = coreKnownTags;
    exports.getTags = getTags;
  }
});

// node_modules/yaml/dist/schema/Schema.js
var require_Schema = __commonJS({
  "node_modules/yaml/dist/schema/Schema.js"(exports) {
    "use strict";
    var identity = require_identity();
    var map = require_map();
    var seq = require_seq();
    var string = require_string();
    var tags = require_tags();
    var sortMapEntriesByKey = (a, b) => a.key < b.key ? -1 : a.key > b.key ? 1 : 0;
    var Schema = class _Schema {
      constructor({ compat, customTags, merge, resolveKnownTags, schema, sortMapEntries, toStringDefaults }) {
        this.compat = Array.isArray(compat) ? tags.getTags(compat, "compat") : compat ? tags.getTags(null, compat) : null;
        this.name = typeof schema === "string" && schema || "core";
        this.knownTags = resolveKnownTags ? tags.coreKnownTags : {};
        this.tags = tags.getTags(customTags, this.name, merge);
        this.toStringOptions = toStringDefaults ?? null;
        Object.defineProperty(this, identity.MAP, { value: map.map });
        Object.defineProperty(this, identity.SCALAR, { value: string.string });
        Object.defineProperty(this, identity.SEQ, { value: seq.seq });
        this.sortMapEntries = typeof sortMapEntries === "function" ? sortMapEntries : sortMapEntries === true ? sortMapEntriesByKey : null;
      }
      clone() {
        const copy = Object.create(_Schema.prototype, Object.getOwnPropertyDescriptors(this));
        copy.tags = this.tags.slice();
        return copy;
      }
    };
    exports.Schema = Schema;
  }
});

// node_modules/yaml/dist/stringify/stringifyDocument.js
var require_stringifyDocument = __commonJS({
  "node_modules/yaml/dist/stringify/stringifyDocument.js"(exports) {
    "use strict";
    var identity = require_identity();
    var stringify = require_stringify();
    var stringifyComment = require_stringifyComment();
    function stringifyDocument(doc, options) {
      const lines = [];
      let hasDirectives = options.directives === true;
      if (options.directives !== false && doc.directives) {
        const dir = doc.directives.toString(doc);
        if (dir) {
          lines.push(dir);
          hasDirectives = true;
        } else if (doc.directives.docStart)
          hasDirectives = true;
      }
      if (hasDirectives)
        lines.push("---");
      const ctx = stringify.createStringifyContext(doc, options);
      const { commentString } = ctx.options;
      if (doc.commentBefore) {
        if (lines.length !== 1)
          lines.unshift("");
        const cs = commentString(doc.commentBefore);
        lines.unshift(stringifyComment.indentComment(cs, ""));
      }
      let chompKeep = false;
      let contentComment = null;
      if (doc.contents) {
        if (identity.isNode(doc.contents)) {
          if (doc.contents.spaceBefore && hasDirectives)
            lines.push("");
          if (doc.contents.commentBefore) {
            const cs = commentString(doc.contents.commentBefore);
            lines.push(stringifyComment.indentComment(cs, ""));
          }
          ctx.forceBlockIndent = !!doc.comment;
          contentComment = doc.contents.comment;
        }
        const onChompKeep = contentComment ? void 0 : () => chompKeep = true;
        let body = stringify.stringify(doc.contents, ctx, () => contentComment = null, onChompKeep);
        if (contentComment)
          body += stringifyComment.lineComment(body, "", commentString(contentComment));
        if ((body[0] === "|" || body[0] === ">") && lines[lines.length - 1] === "---") {
          lines[lines.length - 1] = `--- ${body}`;
        } else
          lines.push(body);
      } else {
        lines.push(stringify.stringify(doc.contents, ctx));
      }
      if (doc.directives?.docEnd) {
        if (doc.comment) {
          const cs = commentString(doc.comment);
          if (cs.includes("\n")) {
            lines.push("...");
            lines.push(stringifyComment.indentComment(cs, ""));
          } else {
            lines.push(`... ${cs}`);
          }
        } else {
          lines.push("...");
        }
      } else {
        let dc = doc.comment;
        if (dc && chompKeep)
          dc = dc.replace(/^\n+/, "");
        if (dc) {
          if ((!chompKeep || contentComment) && lines[lines.length - 1] !== "")
            lines.push("");
          lines.push(stringifyComment.indentComment(commentString(dc), ""));
        }
      }
      return lines.join("\n") + "\n";
    }
    exports.stringifyDocument = stringifyDocument;
  }
});

// node_modules/yaml/dist/doc/Document.js
var require_Document = __commonJS({
  "node_modules/yaml/dist/doc/Document.js"(exports) {
    "use strict";
    var Alias = require_Alias();
    var Collection = require_Collection();
    var identity = require_identity();
    var Pair = require_Pair();
    var toJS = require_toJS();
    var Schema = require_Schema();
    var stringifyDocument = require_stringifyDocument();
    var anchors = require_anchors();
    var applyReviver = require_applyReviver();
    var createNode = require_createNode();
    var directives = require_directives();
    var Document = class _Document {
      constructor(value, replacer, options) {
        this.commentBefore = null;
        this.comment = null;
        this.errors = [];
        this.warnings = [];
        Object.defineProperty(this, identity.NODE_TYPE, { value: identity.DOC });
        let _replacer = null;
        if (typeof replacer === "function" || Array.isArray(replacer)) {
          _replacer = replacer;
        } else if (options === void 0 && replacer) {
          options = replacer;
          replacer = void 0;
        }
        const opt = Object.assign({
          intAsBigInt: false,
          keepSourceTokens: false,
          logLevel: "warn",
          prettyErrors: true,
          strict: true,
          stringKeys: false,
          uniqueKeys: true,
          version: "1.2"
        }, options);
        this.options = opt;
        let { version } = opt;
        if (options?._directives) {
          this.directives = options._directives.atDocument();
          if (this.directives.yaml.explicit)
            version = this.directives.yaml.version;
        } else
          this.directives = new directives.Directives({ version });
        this.setSchema(version, options);
        this.contents = value === void 0 ? null : this.createNode(value, _replacer, options);
      }
      /**
       * Create a deep copy of this Document and its contents.
       *
       * Custom Node values that inherit from `Object` still refer to their original instances.
       */
      clone() {
        const copy = Object.create(_Document.prototype, {
          [identity.NODE_TYPE]: { value: identity.DOC }
        });
        copy.commentBefore = this.commentBefore;
        copy.comment = this.comment;
        copy.errors = this.errors.slice();
        copy.warnings = this.warnings.slice();
        copy.options = Object.assign({}, this.options);
        if (this.directives)
          copy.directives = this.directives.clone();
        copy.schema = this.schema.clone();
        copy.contents = identity.isNode(this.contents) ? this.contents.clone(copy.schema) : this.contents;
        if (this.range)
          copy.range = this.range.slice();
        return copy;
      }
      /** Adds a value to the document. */
      add(value) {
        if (assertCollection(this.contents))
          this.contents.add(value);
      }
      /** Adds a value to the document. */
      addIn(path, value) {
        if (assertCollection(this.contents))
          this.contents.addIn(path, value);
      }
      /**
       * Create a new `Alias` node, ensuring that the target `node` has the required anchor.
       *
       * If `node` already has an anchor, `name` is ignored.
       * Otherwise, the `node.anchor` value will be set to `name`,
       * or if an anchor with that name is already present in the document,
       * `name` will be used as a prefix for a new unique anchor.
       * If `name` is undefined, the generated anchor will use 'a' as a prefix.
       */
      createAlias(node, name) {
        if (!node.anchor) {
          const prev = anchors.anchorNames(this);
          node.anchor = // eslint-disable-next-line @typescript-eslint/prefer-nullish-coalescing
          !name || prev.has(name) ? anchors.findNewAnchor(name || "a", prev) : name;
        }
        return new Alias.Alias(node.anchor);
      }
      createNode(value, replacer, options) {
        let _replacer = void 0;
        if (typeof replacer === "function") {
          value = replacer.call({ "": value }, "", value);
          _replacer = replacer;
        } else if (Array.isArray(replacer)) {
          const keyToStr = (v) => typeof v === "number" || v instanceof String || v instanceof Number;
          const asStr = replacer.filter(keyToStr).map(String);
          if (asStr.length > 0)
            replacer = replacer.concat(asStr);
          _replacer = replacer;
        } else if (options === void 0 && replacer) {
          options = replacer;
          replacer = void 0;
        }
        const { aliasDuplicateObjects, anchorPrefix, flow, keepUndefined, onTagObj, tag } = options ?? {};
        const { onAnchor, setAnchors, sourceObjects } = anchors.createNodeAnchors(
          this,
          // eslint-disable-next-line @typescript-eslint/prefer-nullish-coalescing
          anchorPrefix || "a"
        );
        const ctx = {
          aliasDuplicateObjects: aliasDuplicateObjects ?? true,
          keepUndefined: keepUndefined ?? false,
          onAnchor,
          onTagObj,
          replacer: _replacer,
          schema: this.schema,
          sourceObjects
        };
        const node = createNode.createNode(value, tag, ctx);
        if (flow && identity.isCollection(node))
          node.flow = true;
        setAnchors();
        return node;
      }
      /**
       * Convert a key and a value into a `Pair` using the current schema,
       * recursively wrapping all values as `Scalar` or `Collection` nodes.
       */
      createPair(key, value, options = {}) {
        const k = this.createNode(key, null, options);
        const v = this.createNode(value, null, options);
        return new Pair.Pair(k, v);
      }
      /**
       * Removes a value from the document.
       * @returns `true` if the item was found and removed.
       */
      delete(key) {
        return assertCollection(this.contents) ? this.contents.delete(key) : false;
      }
      /**
       * Removes a value from the document.
       * @returns `true` if the item was found and removed.
       */
      deleteIn(path) {
        if (Collection.isEmptyPath(path)) {
          if (this.contents == null)
            return false;
          this.contents = null;
          return true;
        }
        return assertCollection(this.contents) ? this.contents.deleteIn(path) : false;
      }
      /**
       * Returns item at `key`, or `undefined` if not found. By default unwraps
       * scalar values from their surrounding node; to disable set `keepScalar` to
       * `true` (collections are always returned intact).
       */
      get(key, keepScalar) {
        return identity.isCollection(this.contents) ? this.contents.get(key, keepScalar) : void 0;
      }
      /**
       * Returns item at `path`, or `undefined` if not found. By default unwraps
       * scalar values from their surrounding node; to disable set `keepScalar` to
       * `true` (collections are always returned intact).
       */
      getIn(path, keepScalar) {
        if (Collection.isEmptyPath(path))
          return !keepScalar && identity.isScalar(this.contents) ? this.contents.value : this.contents;
        return identity.isCollection(this.contents) ? this.contents.getIn(path, keepScalar) : void 0;
      }
      /**
       * Checks if the document includes a value with the key `key`.
       */
      has(key) {
        return identity.isCollection(this.contents) ? this.contents.has(key) : false;
      }
      /**
       * Checks if the document includes a value at `path`.
       */
      hasIn(path) {
        if (Collection.isEmptyPath(path))
          return this.contents !== void 0;
        return identity.isCollection(this.contents) ? this.contents.hasIn(path) : false;
      }
      /**
       * Sets a value in this document. For `!!set`, `value` needs to be a
       * boolean to add/remove the item from the set.
       */
      set(key, value) {
        if (this.contents == null) {
          this.contents = Collection.collectionFromPath(this.schema, [key], value);
        } else if (assertCollection(this.contents)) {
          this.contents.set(key, value);
        }
      }
      /**
       * Sets a value in this document. For `!!set`, `value` needs to be a
       * boolean to add/remove the item from the set.
       */
      setIn(path, value) {
        if (Collection.isEmptyPath(path)) {
          this.contents = value;
        } else if (this.contents == null) {
          this.contents = Collection.collectionFromPath(this.schema, Array.from(path), value);
        } else if (assertCollection(this.contents)) {
          this.contents.setIn(path, value);
        }
      }
      /**
       * Change the YAML version and schema used by the document.
       * A `null` version disables support for directives, explicit tags, anchors, and aliases.
       * It also requires the `schema` option to be given as a `Schema` instance value.
       *
       * Overrides all previously set schema options.
       */
      setSchema(version, options = {}) {
        if (typeof version === "number")
          version = String(version);
        let opt;
        switch (version) {
          case "1.1":
            if (this.directives)
              this.directives.yaml.version = "1.1";
            else
              this.directives = new directives.Directives({ version: "1.1" });
            opt = { resolveKnownTags: false, schema: "yaml-1.1" };
            break;
          case "1.2":
          case "next":
            if (this.directives)
              this.directives.yaml.version = version;
            else
              this.directives = new directives.Directives({ version });
            opt = { resolveKnownTags: true, schema: "core" };
            break;
          case null:
            if (this.directives)
              delete this.directives;
            opt = null;
            break;
          default: {
            const sv = JSON.stringify(version);
            throw new Error(`Expected '1.1', '1.2' or null as first argument, but found: ${sv}`);
          }
        }
        if (options.schema instanceof Object)
          this.schema = options.schema;
        else if (opt)
          this.schema = new Schema.Schema(Object.assign(opt, options));
        else
          throw new Error(`With a null YAML version, the { schema: Schema } option is required`);
      }
      // json & jsonArg are only used from toJSON()
      toJS({ json, jsonArg, mapAsMap, maxAliasCount, onAnchor, reviver } = {}) {
        const ctx = {
          anchors: /* @__PURE__ */ new Map(),
          doc: this,
          keep: !json,
          mapAsMap: mapAsMap === true,
          mapKeyWarned: false,
          maxAliasCount: typeof maxAliasCount === "number" ? maxAliasCount : 100
        };
        const res = toJS.toJS(this.contents, jsonArg ?? "", ctx);
        if (typeof onAnchor === "function")
          for (const { count, res: res2 } of ctx.anchors.values())
            onAnchor(res2, count);
        return typeof reviver === "function" ? applyReviver.applyReviver(reviver, { "": res }, "", res) : res;
      }
      /**
       * A JSON representation of the document `contents`.
       *
       * @param jsonArg Used by `JSON.stringify` to indicate the array index or
       *   property name.
       */
      toJSON(jsonArg, onAnchor) {
        return this.toJS({ json: true, jsonArg, mapAsMap: false, onAnchor });
      }
      /** A YAML representation of the document. */
      toString(options = {}) {
        if (this.errors.length > 0)
          throw new Error("Document with errors cannot be stringified");
        if ("indent" in options && (!Number.isInteger(options.indent) || Number(options.indent) <= 0)) {
          const s = JSON.stringify(options.indent);
          throw new Error(`"indent" option must be a positive integer, not ${s}`);
        }
        return stringifyDocument.stringifyDocument(this, options);
      }
    };
    function assertCollection(contents) {
      if (identity.isCollection(contents))
        return true;
      throw new Error("Expected a YAML collection as document contents");
    }
    exports.Document = Document;
  }
});

// node_modules/yaml/dist/errors.js
var require_errors = __commonJS({
  "node_modules/yaml/dist/errors.js"(exports) {
    "use strict";
    var YAMLError = class extends Error {
      constructor(name, pos, code, message) {
        super();
        this.name = name;
        this.code = code;
        this.message = message;
        this.pos = pos;
      }
    };
    var YAMLParseError = class extends YAMLError {
      constructor(pos, code, message) {
        super("YAMLParseError", pos, code, message);
      }
    };
    var YAMLWarning = class extends YAMLError {
      constructor(pos, code, message) {
        super("YAMLWarning", pos, code, message);
      }
    };
    var prettifyError = (src, lc) => (error) => {
      if (error.pos[0] === -1)
        return;
      error.linePos = error.pos.map((pos) => lc.linePos(pos));
      const { line, col } = error.linePos[0];
      error.message += ` at line ${line}, column ${col}`;
      let ci = col - 1;
      let lineStr = src.substring(lc.lineStarts[line - 1], lc.lineStarts[line]).replace(/[\n\r]+$/, "");
      if (ci >= 60 && lineStr.length > 80) {
        const trimStart = Math.min(ci - 39, lineStr.length - 79);
        lineStr = "…" + lineStr.substring(trimStart);
        ci -= trimStart - 1;
      }
      if (lineStr.length > 80)
        lineStr = lineStr.substring(0, 79) + "…";
      if (line > 1 && /^ *$/.test(lineStr.substring(0, ci))) {
        let prev = src.substring(lc.lineStarts[line - 2], lc.lineStarts[line - 1]);
        if (prev.length > 80)
          prev = prev.substring(0, 79) + "…\n";
        lineStr = prev + lineStr;
      }
      if (/[^ ]/.test(lineStr)) {
        let count = 1;
        const end = error.linePos[1];
        if (end?.line === line && end.col > col) {
          count = Math.max(1, Math.min(end.col - col, 80 - ci));
        }
        const pointer = " ".repeat(ci) + "^".repeat(count);
        error.message += `:

${lineStr}
${pointer}
`;
      }
    };
    exports.YAMLError = YAMLError;
    exports.YAMLParseError = YAMLParseError;
    exports.YAMLWarning = YAMLWarning;
    exports.prettifyError = prettifyError;
  }
});

// node_modules/yaml/dist/compose/resolve-props.js
var require_resolve_props = __commonJS({
  "node_modules/yaml/dist/compose/resolve-props.js"(exports) {
    "use strict";
    function resolveProps(tokens, { flow, indicator, next, offset, onError, parentIndent, startOnNewline }) {
      let spaceBefore = false;
      let atNewline = startOnNewline;
      let hasSpace = startOnNewline;
      let comment = "";
      let commentSep = "";
      let hasNewline = false;
      let reqSpace = false;
      let tab = null;
      let anchor = null;
      let tag = null;
      let newlineAfterProp = null;
      let comma = null;
      let found = null;
      let start = null;
      for (const token of tokens) {
        if (reqSpace) {
          if (token.type !== "space" && token.type !== "newline" && token.type !== "comma")
            onError(token.offset, "MISSING_CHAR", "Tags and anchors must be separated from the next token by white space");
          reqSpace = false;
        }
        if (tab) {
          if (atNewline && token.type !== "comment" && token.type !== "newline") {
            onError(tab, "TAB_AS_INDENT", "Tabs are not allowed as indentation");
          }
          tab = null;
        }
        switch (token.type) {
          case "space":
            if (!flow && (indicator !== "doc-start" || next?.type !== "flow-collection") && token.source.includes("	")) {
              tab = token;
            }
            hasSpace = true;
            break;
          case "comment": {
            if (!hasSpace)
              onError(token, "MISSING_CHAR", "Comments must be separated from other tokens by white space characters");
            const cb = token.source.substring(1) || " ";
            if (!comment)
              comment = cb;
            else
              comment += commentSep + cb;
            commentSep = "";
            atNewline = false;
            break;
          }
          case "newline":
            if (atNewline) {
              if (comment)
                comment += token.source;
              else if (!found || indicator !== "seq-item-ind")
                spaceBefore = true;
            } else
              commentSep += token.source;
            atNewline = true;
            hasNewline = true;
            if (anchor || tag)
              newlineAfterProp = token;
            hasSpace = true;
            break;
          case "anchor":
            if (anchor)
              onError(token, "MULTIPLE_ANCHORS", "A node can have at most one anchor");
            if (token.source.endsWith(":"))
              onError(token.offset + token.source.length - 1, "BAD_ALIAS", "Anchor ending in : is ambiguous", true);
            anchor = token;
            start ?? (start = token.offset);
            atNewline = false;
            hasSpace = false;
            reqSpace = true;
            break;
          case "tag": {
            if (tag)
              onError(token, "MULTIPLE_TAGS", "A node can have at most one tag");
            tag = token;
            start ?? (start = token.offset);
            atNewline = false;
            hasSpace = false;
            reqSpace = true;
            break;
          }
          case indicator:
            if (anchor || tag)
              onError(token, "BAD_PROP_ORDER", `Anchors and tags must be after the ${token.source} indicator`);
            if (found)
              onError(token, "UNEXPECTED_TOKEN", `Unexpected ${token.source} in ${flow ?? "collection"}`);
            found = token;
            atNewline = indicator === "seq-item-ind" || indicator === "explicit-key-ind";
            hasSpace = false;
            break;
          case "comma":
            if (flow) {
              if (comma)
                onError(token, "UNEXPECTED_TOKEN", `Unexpected , in ${flow}`);
              comma = token;
              atNewline = false;
              hasSpace = false;
              break;
            }
          // else fallthrough
          default:
            onError(token, "UNEXPECTED_TOKEN", `Unexpected ${token.type} token`);
            atNewline = false;
            hasSpace = false;
        }
      }
      const last = tokens[tokens.length - 1];
      const end = last ? last.offset + last.source.length : offset;
      if (reqSpace && next && next.type !== "space" && next.type !== "newline" && next.type !== "comma" && (next.type !== "scalar" || next.source !== "")) {
        onError(next.offset, "MISSING_CHAR", "Tags and anchors must be separated from the next token by white space");
      }
      if (tab && (atNewline && tab.indent <= parentIndent || next?.type === "block-map" || next?.type === "block-seq"))
        onError(tab, "TAB_AS_INDENT", "Tabs are not allowed as indentation");
      return {
        comma,
        found,
        spaceBefore,
        comment,
        hasNewline,
        anchor,
        tag,
        newlineAfterProp,
        end,
        start: start ?? end
      };
    }
    exports.resolveProps = resolveProps;
  }
});

// node_modules/yaml/dist/compose/util-contains-newline.js
var require_util_contains_newline = __commonJS({
  "node_modules/yaml/dist/compose/util-contains-newline.js"(exports) {
    "use strict";
    function containsNewline(key) {
      if (!key)
        return null;
      switch (key.type) {
        case "alias":
        case "scalar":
        case "double-quoted-scalar":
        case "single-quoted-scalar":
          if (key.source.includes("\n"))
            return true;
          if (key.end) {
            for (const st of key.end)
              if (st.type === "newline")
                return true;
          }
          return false;
        case "flow-collection":
          for (const it of key.items) {
            for (const st of it.start)
              if (st.type === "newline")
                return true;
            if (it.sep) {
              for (const st of it.sep)
                if (st.type === "newline")
                  return true;
            }
            if (containsNewline(it.key) || containsNewline(it.value))
              return true;
          }
          return false;
        default:
          return true;
      }
    }
    exports.containsNewline = containsNewline;
  }
});

// node_modules/yaml/dist/compose/util-flow-indent-check.js
var require_util_flow_indent_check = __commonJS({
  "node_modules/yaml/dist/compose/util-flow-indent-check.js"(exports) {
    "use strict";
    var utilContainsNewline = require_util_contains_newline();
    function flowIndentCheck(indent, fc, onError) {
      if (fc?.type === "flow-collection") {
        const end = fc.end[0];
        if (end.indent === indent && (end.source === "]" || end.source === "}") && utilContainsNewline.containsNewline(fc)) {
          const msg = "Flow end indicator should be more indented than parent";
          onError(end, "BAD_INDENT", msg, true);
        }
      }
    }
    exports.flowIndentCheck = flowIndentCheck;
  }
});

// node_modules/yaml/dist/compose/util-map-includes.js
var require_util_map_includes = __commonJS({
  "node_modules/yaml/dist/compose/util-map-includes.js"(exports) {
    "use strict";
    var identity = require_identity();
    function mapIncludes(ctx, items, search) {
      const { uniqueKeys } = ctx.options;
      if (uniqueKeys === false)
        return false;
      const isEqual = typeof uniqueKeys === "function" ? uniqueKeys : (a, b) => a === b || identity.isScalar(a) && identity.isScalar(b) && a.value === b.value;
      return items.some((pair) => isEqual(pair.key, search));
    }
    exports.mapIncludes = mapIncludes;
  }
});

// node_modules/yaml/dist/compose/resolve-block-map.js
var require_resolve_block_map = __commonJS({
  "node_modules/yaml/dist/compose/resolve-block-map.js"(exports) {
    "use strict";
    var Pair = require_Pair();
    var YAMLMap = require_YAMLMap();
    var resolveProps = require_resolve_props();
    var utilContainsNewline = require_util_contains_newline();
    var utilFlowIndentCheck = require_util_flow_indent_check();
    var utilMapIncludes = require_util_map_includes();
    var startColMsg = "All mapping items must start at the same column";
    function resolveBlockMap({ composeNode, composeEmptyNode }, ctx, bm, onError, tag) {
      const NodeClass = tag?.nodeClass ?? YAMLMap.YAMLMap;
      const map = new NodeClass(ctx.schema);
      if (ctx.atRoot)
        ctx.atRoot = false;
      let offset = bm.offset;
      let commentEnd = null;
      for (const collItem of bm.items) {
        const { start, key, sep: sep3, value } = collItem;
        const keyProps = resolveProps.resolveProps(start, {
          indicator: "explicit-key-ind",
          next: key ?? sep3?.[0],
          offset,
          onError,
          parentIndent: bm.indent,
          startOnNewline: true
        });
        const implicitKey = !keyProps.found;
        if (implicitKey) {
          if (key) {
            if (key.type === "block-seq")
              onError(offset, "BLOCK_AS_IMPLICIT_KEY", "A block sequence may not be used as an implicit map key");
            else if ("indent" in key && key.indent !== bm.indent)
              onError(offset, "BAD_INDENT", startColMsg);
          }
          if (!keyProps.anchor && !keyProps.tag && !sep3) {
            commentEnd = keyProps.end;
            if (keyProps.comment) {
              if (map.comment)
                map.comment += "\n" + keyProps.comment;
              else
                map.comment = keyProps.comment;
            }
            continue;
          }
          if (keyProps.newlineAfterProp || utilContainsNewline.containsNewline(key)) {
            onError(key ?? start[start.length - 1], "MULTILINE_IMPLICIT_KEY", "Implicit keys need to be on a single line");
          }
        } else if (keyProps.found?.indent !== bm.indent) {
          onError(offset, "BAD_INDENT", startColMsg);
        }
        ctx.atKey = true;
        const keyStart = keyProps.end;
        const keyNode = key ? composeNode(ctx, key, keyProps, onError) : composeEmptyNode(ctx, keyStart, start, null, keyProps, onError);
        if (ctx.schema.compat)
          utilFlowIndentCheck.flowIndentCheck(bm.indent, key, onError);
        ctx.atKey = false;
        if (utilMapIncludes.mapIncludes(ctx, map.items, keyNode))
          onError(keyStart, "DUPLICATE_KEY", "Map keys must be unique");
        const valueProps = resolveProps.resolveProps(sep3 ?? [], {
          indicator: "map-value-ind",
          next: value,
          offset: keyNode.range[2],
          onError,
          parentIndent: bm.indent,
          startOnNewline: !key || key.type === "block-scalar"
        });
        offset = valueProps.end;
        if (valueProps.found) {
          if (implicitKey) {
            if (value?.type === "block-map" && !valueProps.hasNewline)
              onError(offset, "BLOCK_AS_IMPLICIT_KEY", "Nested mappings are not allowed in compact mappings");
            if (ctx.options.strict && keyProps.start < valueProps.found.offset - 1024)
              onError(keyNode.range, "KEY_OVER_1024_CHARS", "The : indicator must be at most 1024 chars after the start of an implicit block mapping key");
          }
          const valueNode = value ? composeNode(ctx, value, valueProps, onError) : composeEmptyNode(ctx, offset, sep3, null, valueProps, onError);
          if (ctx.schema.compat)
            utilFlowIndentCheck.flowIndentCheck(bm.indent, value, onError);
          offset = valueNode.range[2];
          const pair = new Pair.Pair(keyNode, valueNode);
          if (ctx.options.keepSourceTokens)
            pair.srcToken = collItem;
          map.items.push(pair);
        } else {
          if (implicitKey)
            onError(keyNode.range, "MISSING_CHAR", "Implicit map keys need to be followed by map values");
          if (valueProps.comment) {
            if (keyNode.comment)
              keyNode.comment += "\n" + valueProps.comment;
            else
              keyNode.comment = valueProps.comment;
          }
          const pair = new Pair.Pair(keyNode);
          if (ctx.options.keepSourceTokens)
            pair.srcToken = collItem;
          map.items.push(pair);
        }
      }
      if (commentEnd && commentEnd < offset)
        onError(commentEnd, "IMPOSSIBLE", "Map comment with trailing content");
      map.range = [bm.offset, offset, commentEnd ?? offset];
      return map;
    }
    exports.resolveBlockMap = resolveBlockMap;
  }
});

// node_modules/yaml/dist/compose/resolve-block-seq.js
var require_resolve_block_seq = __commonJS({
  "node_modules/yaml/dist/compose/resolve-block-seq.js"(exports) {
    "use strict";
    var YAMLSeq = require_YAMLSeq();
    var resolveProps = require_resolve_props();
    var utilFlowIndentCheck = require_util_flow_indent_check();
    function resolveBlockSeq({ composeNode, composeEmptyNode }, ctx, bs, onError, tag) {
      const NodeClass = tag?.nodeClass ?? YAMLSeq.YAMLSeq;
      const seq = new NodeClass(ctx.schema);
      if (ctx.atRoot)
        ctx.atRoot = false;
      if (ctx.atKey)
        ctx.atKey = false;
      let offset = bs.offset;
      let commentEnd = null;
      for (const { start, value } of bs.items) {
        const props = resolveProps.resolveProps(start, {
          indicator: "seq-item-ind",
          next: value,
          offset,
          onError,
          parentIndent: bs.indent,
          startOnNewline: true
        });
        if (!props.found) {
          if (props.anchor || props.tag || value) {
            if (value?.type === "block-seq")
              onError(props.end, "BAD_INDENT", "All sequence items must start at the same column");
            else
              onError(offset, "MISSING_CHAR", "Sequence item without - indicator");
          } else {
            commentEnd = props.end;
            if (props.comment)
              seq.comment = props.comment;
            continue;
          }
        }
        const node = value ? composeNode(ctx, value, props, onError) : composeEmptyNode(ctx, props.end, start, null, props, onError);
        if (ctx.schema.compat)
          utilFlowIndentCheck.flowIndentCheck(bs.indent, value, onError);
        offset = node.range[2];
        seq.items.push(node);
      }
      seq.range = [bs.offset, offset, commentEnd ?? offset];
      return seq;
    }
    exports.resolveBlockSeq = resolveBlockSeq;
  }
});

// node_modules/yaml/dist/compose/resolve-end.js
var require_resolve_end = __commonJS({
  "node_modules/yaml/dist/compose/resolve-end.js"(exports) {
    "use strict";
    function resolveEnd(end, offset, reqSpace, onError) {
      let comment = "";
      if (end) {
        let hasSpace = false;
        let sep3 = "";
        for (const token of end) {
          const { source, type } = token;
          switch (type) {
            case "space":
              hasSpace = true;
              break;
            case "comment": {
              if (reqSpace && !hasSpace)
                onError(token, "MISSING_CHAR", "Comments must be separated from other tokens by white space characters");
              const cb = source.substring(1) || " ";
              if (!comment)
                comment = cb;
              else
                comment += sep3 + cb;
              sep3 = "";
              break;
            }
            case "newline":
              if (comment)
                sep3 += source;
              hasSpace = true;
              break;
            default:
              onError(token, "UNEXPECTED_TOKEN", `Unexpected ${type} at node end`);
          }
          offset += source.length;
        }
      }
      return { comment, offset };
    }
    exports.resolveEnd = resolveEnd;
  }
});

// node_modules/yaml/dist/compose/resolve-flow-collection.js
var require_resolve_flow_collection = __commonJS({
  "node_modules/yaml/dist/compose/resolve-flow-collection.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Pair = require_Pair();
    var YAMLMap = require_YAMLMap();
    var YAMLSeq = require_YAMLSeq();
    var resolveEnd = require_resolve_end();
    var resolveProps = require_resolve_props();
    var utilContainsNewline = require_util_contains_newline();
    var utilMapIncludes = require_util_map_includes();
    var blockMsg = "Block collections are not allowed within flow collections";
    var isBlock = (token) => token && (token.type === "block-map" || token.type === "block-seq");
    function resolveFlowCollection({ composeNode, composeEmptyNode }, ctx, fc, onError, tag) {
      const isMap4 = fc.start.source === "{";
      const fcName = isMap4 ? "flow map" : "flow sequence";
      const NodeClass = tag?.nodeClass ?? (isMap4 ? YAMLMap.YAMLMap : YAMLSeq.YAMLSeq);
      const coll = new NodeClass(ctx.schema);
      coll.flow = true;
      const atRoot = ctx.atRoot;
      if (atRoot)
        ctx.atRoot = false;
      if (ctx.atKey)
        ctx.atKey = false;
      let offset = fc.offset + fc.start.source.length;
      for (let i = 0; i < fc.items.length; ++i) {
        const collItem = fc.items[i];
        const { start, key, sep: sep3, value } = collItem;
        const props = resolveProps.resolveProps(start, {
          flow: fcName,
          indicator: "explicit-key-ind",
          next: key ?? sep3?.[0],
          offset,
          onError,
          parentIndent: fc.indent,
          startOnNewline: false
        });
        if (!props.found) {
          if (!props.anchor && !props.tag && !sep3 && !value) {
            if (i === 0 && props.comma)
              onError(props.comma, "UNEXPECTED_TOKEN", `Unexpected , in ${fcName}`);
            else if (i < fc.items.length - 1)
              onError(props.start, "UNEXPECTED_TOKEN", `Unexpected empty item in ${fcName}`);
            if (props.comment) {
              if (coll.comment)
                coll.comment += "\n" + props.comment;
              else
                coll.comment = props.comment;
            }
            offset = props.end;
            continue;
          }
          if (!isMap4 && ctx.options.strict && utilContainsNewline.containsNewline(key))
            onError(
              key,
              // checked by containsNewline()
              "MULTILINE_IMPLICIT_KEY",
              "Implicit keys of flow sequence pairs need to be on a single line"
            );
        }
        if (i === 0) {
          if (props.comma)
            onError(props.comma, "UNEXPECTED_TOKEN", `Unexpected , in ${fcName}`);
        } else {
          if (!props.comma)
            onError(props.start, "MISSING_CHAR", `Missing , between ${fcName} items`);
          if (props.comment) {
            let prevItemComment = "";
            loop: for (const st of start) {
              switch (st.type) {
                case "comma":
                case "space":
                  break;
                case "comment":
                  prevItemComment = st.source.substring(1);
                  break loop;
                default:
                  break loop;
              }
            }
            if (prevItemComment) {
              let prev = coll.items[coll.items.length - 1];
              if (identity.isPair(prev))
                prev = prev.value ?? prev.key;
              if (prev.comment)
                prev.comment += "\n" + prevItemComment;
              else
                prev.comment = prevItemComment;
              props.comment = props.comment.substring(prevItemComment.length + 1);
            }
          }
        }
        if (!isMap4 && !sep3 && !props.found) {
          const valueNode = value ? composeNode(ctx, value, props, onError) : composeEmptyNode(ctx, props.end, sep3, null, props, onError);
          coll.items.push(valueNode);
          offset = valueNode.range[2];
          if (isBlock(value))
            onError(valueNode.range, "BLOCK_IN_FLOW", blockMsg);
        } else {
          ctx.atKey = true;
          const keyStart = props.end;
          const keyNode = key ? composeNode(ctx, key, props, onError) : composeEmptyNode(ctx, keyStart, start, null, props, onError);
          if (isBlock(key))
            onError(keyNode.range, "BLOCK_IN_FLOW", blockMsg);
          ctx.atKey = false;
          const valueProps = resolveProps.resolveProps(sep3 ?? [], {
            flow: fcName,
            indicator: "map-value-ind",
            next: value,
            offset: keyNode.range[2],
            onError,
            parentIndent: fc.indent,
            startOnNewline: false
          });
          if (valueProps.found) {
            if (!isMap4 && !props.found && ctx.options.strict) {
              if (sep3)
                for (const st of sep3) {
                  if (st === valueProps.found)
                    break;
                  if (st.type === "newline") {
                    onError(st, "MULTILINE_IMPLICIT_KEY", "Implicit keys of flow sequence pairs need to be on a single line");
                    break;
                  }
                }
              if (props.start < valueProps.found.offset - 1024)
                onError(valueProps.found, "KEY_OVER_1024_CHARS", "The : indicator must be at most 1024 chars after the start of an implicit flow sequence key");
            }
          } else if (value) {
            if ("source" in value && value.source?.[0] === ":")
              onError(value, "MISSING_CHAR", `Missing space after : in ${fcName}`);
            else
              onError(valueProps.start, "MISSING_CHAR", `Missing , or : between ${fcName} items`);
          }
          const valueNode = value ? composeNode(ctx, value, valueProps, onError) : valueProps.found ? composeEmptyNode(ctx, valueProps.end, sep3, null, valueProps, onError) : null;
          if (valueNode) {
            if (isBlock(value))
              onError(valueNode.range, "BLOCK_IN_FLOW", blockMsg);
          } else if (valueProps.comment) {
            if (keyNode.comment)
              keyNode.comment += "\n" + valueProps.comment;
            else
              keyNode.comment = valueProps.comment;
          }
          const pair = new Pair.Pair(keyNode, valueNode);
          if (ctx.options.keepSourceTokens)
            pair.srcToken = collItem;
          if (isMap4) {
            const map = coll;
            if (utilMapIncludes.mapIncludes(ctx, map.items, keyNode))
              onError(keyStart, "DUPLICATE_KEY", "Map keys must be unique");
            map.items.push(pair);
          } else {
            const map = new YAMLMap.YAMLMap(ctx.schema);
            map.flow = true;
            map.items.push(pair);
            const endRange = (valueNode ?? keyNode).range;
            map.range = [keyNode.range[0], endRange[1], endRange[2]];
            coll.items.push(map);
          }
          offset = valueNode ? valueNode.range[2] : valueProps.end;
        }
      }
      const expectedEnd = isMap4 ? "}" : "]";
      const [ce, ...ee] = fc.end;
      let cePos = offset;
      if (ce?.source === expectedEnd)
        cePos = ce.offset + ce.source.length;
      else {
        const name = fcName[0].toUpperCase() + fcName.substring(1);
        const msg = atRoot ? `${name} must end with a ${expectedEnd}` : `${name} in block collection must be sufficiently indented and end with a ${expectedEnd}`;
        onError(offset, atRoot ? "MISSING_CHAR" : "BAD_INDENT", msg);
        if (ce && ce.source.length !== 1)
          ee.unshift(ce);
      }
      if (ee.length > 0) {
        const end = resolveEnd.resolveEnd(ee, cePos, ctx.options.strict, onError);
        if (end.comment) {
          if (coll.comment)
            coll.comment += "\n" + end.comment;
          else
            coll.comment = end.comment;
        }
        coll.range = [fc.offset, cePos, end.offset];
      } else {
        coll.range = [fc.offset, cePos, cePos];
      }
      return coll;
    }
    exports.resolveFlowCollection = resolveFlowCollection;
  }
});

// node_modules/yaml/dist/compose/compose-collection.js
var require_compose_collection = __commonJS({
  "node_modules/yaml/dist/compose/compose-collection.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Scalar = require_Scalar();
    var YAMLMap = require_YAMLMap();
    var YAMLSeq = require_YAMLSeq();
    var resolveBlockMap = require_resolve_block_map();
    var resolveBlockSeq = require_resolve_block_seq();
    var resolveFlowCollection = require_resolve_flow_collection();
    function resolveCollection(CN, ctx, token, onError, tagName, tag) {
      const coll = token.type === "block-map" ? resolveBlockMap.resolveBlockMap(CN, ctx, token, onError, tag) : token.type === "block-seq" ? resolveBlockSeq.resolveBlockSeq(CN, ctx, token, onError, tag) : resolveFlowCollection.resolveFlowCollection(CN, ctx, token, onError, tag);
      const Coll = coll.constructor;
      if (tagName === "!" || tagName === Coll.tagName) {
        coll.tag = Coll.tagName;
        return coll;
      }
      if (tagName)
        coll.tag = tagName;
      return coll;
    }
    function composeCollection(CN, ctx, token, props, onError) {
      const tagToken = props.tag;
      const tagName = !tagToken ? null : ctx.directives.tagName(tagToken.source, (msg) => onError(tagToken, "TAG_RESOLVE_FAILED", msg));
      if (token.type === "block-seq") {
        const { anchor, newlineAfterProp: nl } = props;
        const lastProp = anchor && tagToken ? anchor.offset > tagToken.offset ? anchor : tagToken : anchor ?? tagToken;
        if (lastProp && (!nl || nl.offset < lastProp.offset)) {
          const message = "Missing newline after block sequence props";
          onError(lastProp, "MISSING_CHAR", message);
        }
      }
      const expType = token.type === "block-map" ? "map" : token.type === "block-seq" ? "seq" : token.start.source === "{" ? "map" : "seq";
      if (!tagToken || !tagName || tagName === "!" || tagName === YAMLMap.YAMLMap.tagName && expType === "map" || tagName === YAMLSeq.YAMLSeq.tagName && expType === "seq") {
        return resolveCollection(CN, ctx, token, onError, tagName);
      }
      let tag = ctx.schema.tags.find((t) => t.tag === tagName && t.collection === expType);
      if (!tag) {
        const kt = ctx.schema.knownTags[tagName];
        if (kt?.collection === expType) {
          ctx.schema.tags.push(Object.assign({}, kt, { default: false }));
          tag = kt;
        } else {
          if (kt) {
            onError(tagToken, "BAD_COLLECTION_TYPE", `${kt.tag} used for ${expType} collection, but expects ${kt.collection ?? "scalar"}`, true);
          } else {
            onError(tagToken, "TAG_RESOLVE_FAILED", `Unresolved tag: ${tagName}`, true);
          }
          return resolveCollection(CN, ctx, token, onError, tagName);
        }
      }
      const coll = resolveCollection(CN, ctx, token, onError, tagName, tag);
      const res = tag.resolve?.(coll, (msg) => onError(tagToken, "TAG_RESOLVE_FAILED", msg), ctx.options) ?? coll;
      const node = identity.isNode(res) ? res : new Scalar.Scalar(res);
      node.range = coll.range;
      node.tag = tagName;
      if (tag?.format)
        node.format = tag.format;
      return node;
    }
    exports.composeCollection = composeCollection;
  }
});

// node_modules/yaml/dist/compose/resolve-block-scalar.js
var require_resolve_block_scalar = __commonJS({
  "node_modules/yaml/dist/compose/resolve-block-scalar.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    function resolveBlockScalar(ctx, scalar, onError) {
      const start = scalar.offset;
      const header = parseBlockScalarHeader(scalar, ctx.options.strict, onError);
      if (!header)
        return { value: "", type: null, comment: "", range: [start, start, start] };
      const type = header.mode === ">" ? Scalar.Scalar.BLOCK_FOLDED : Scalar.Scalar.BLOCK_LITERAL;
      const lines = scalar.source ? splitLines(scalar.source) : [];
      let chompStart = lines.length;
      for (let i = lines.length - 1; i >= 0; --i) {
        const content = lines[i][1];
        if (content === "" || content === "\r")
          chompStart = i;
        else
          break;
      }
      if (chompStart === 0) {
        const value2 = header.chomp === "+" && lines.length > 0 ? "\n".repeat(Math.max(1, lines.length - 1)) : "";
        let end2 = start + header.length;
        if (scalar.source)
          end2 += scalar.source.length;
        return { value: value2, type, comment: header.comment, range: [start, end2, end2] };
      }
      let trimIndent = scalar.indent + header.indent;
      let offset = scalar.offset + header.length;
      let contentStart = 0;
      for (let i = 0; i < chompStart; ++i) {
        const [indent, content] = lines[i];
        if (content === "" || content === "\r") {
          if (header.indent === 0 && indent.length > trimIndent)
            trimIndent = indent.length;
        } else {
          if (indent.length < trimIndent) {
            const message = "Block scalars with more-indented leading empty lines must use an explicit indentation indicator";
            onError(offset + indent.length, "MISSING_CHAR", message);
          }
          if (header.indent === 0)
            trimIndent = indent.length;
          contentStart = i;
          if (trimIndent === 0 && !ctx.atRoot) {
            const message = "Block scalar values in collections must be indented";
            onError(offset, "BAD_INDENT", message);
          }
          break;
        }
        offset += indent.length + content.length + 1;
      }
      for (let i = lines.length - 1; i >= chompStart; --i) {
        if (lines[i][0].length > trimIndent)
          chompStart = i + 1;
      }
      let value = "";
      let sep3 = "";
      let prevMoreIndented = false;
      for (let i = 0; i < contentStart; ++i)
        value += lines[i][0].slice(trimIndent) + "\n";
      for (let i = contentStart; i < chompStart; ++i) {
        let [indent, content] = lines[i];
        offset += indent.length + content.length + 1;
        const crlf = content[content.length - 1] === "\r";
        if (crlf)
          content = content.slice(0, -1);
        if (content && indent.length < trimIndent) {
          const src = header.indent ? "explicit indentation indicator" : "first line";
          const message = `Block scalar lines must not be less indented than their ${src}`;
          onError(offset - content.length - (crlf ? 2 : 1), "BAD_INDENT", message);
          indent = "";
        }
        if (type === Scalar.Scalar.BLOCK_LITERAL) {
          value += sep3 + indent.slice(trimIndent) + content;
          sep3 = "\n";
        } else if (indent.length > trimIndent || content[0] === "	") {
          if (sep3 === " ")
            sep3 = "\n";
          else if (!prevMoreIndented && sep3 === "\n")
            sep3 = "\n\n";
          value += sep3 + indent.slice(trimIndent) + content;
          sep3 = "\n";
          prevMoreIndented = true;
        } else if (content === "") {
          if (sep3 === "\n")
            value += "\n";
          else
            sep3 = "\n";
        } else {
          value += sep3 + content;
          sep3 = " ";
          prevMoreIndented = false;
        }
      }
      switch (header.chomp) {
        case "-":
          break;
        case "+":
          for (let i = chompStart; i < lines.length; ++i)
            value += "\n" + lines[i][0].slice(trimIndent);
          if (value[value.length - 1] !== "\n")
            value += "\n";
          break;
        default:
          value += "\n";
      }
      const end = start + header.length + scalar.source.length;
      return { value, type, comment: header.comment, range: [start, end, end] };
    }
    function parseBlockScalarHeader({ offset, props }, strict, onError) {
      if (props[0].type !== "block-scalar-header") {
        onError(props[0], "IMPOSSIBLE", "Block scalar header not found");
        return null;
      }
      const { source } = props[0];
      const mode = source[0];
      let indent = 0;
      let chomp = "";
      let error = -1;
      for (let i = 1; i < source.length; ++i) {
        const ch = source[i];
        if (!chomp && (ch === "-" || ch === "+"))
          chomp = ch;
        else {
          const n = Number(ch);
          if (!indent && n)
            indent = n;
          else if (error === -1)
            error = offset + i;
        }
      }
      if (error !== -1)
        onError(error, "UNEXPECTED_TOKEN", `Block scalar header includes extra characters: ${source}`);
      let hasSpace = false;
      let comment = "";
      let length = source.length;
      for (let i = 1; i < props.length; ++i) {
        const token = props[i];
        switch (token.type) {
          case "space":
            hasSpace = true;
          // fallthrough
          case "newline":
            length += token.source.length;
            break;
          case "comment":
            if (strict && !hasSpace) {
              const message = "Comments must be separated from other tokens by white space characters";
              onError(token, "MISSING_CHAR", message);
            }
            length += token.source.length;
            comment = token.source.substring(1);
            break;
          case "error":
            onError(token, "UNEXPECTED_TOKEN", token.message);
            length += token.source.length;
            break;
          /* istanbul ignore next should not happen */
          default: {
            const message = `Unexpected token in block scalar header: ${token.type}`;
            onError(token, "UNEXPECTED_TOKEN", message);
            const ts = token.source;
            if (ts && typeof ts === "string")
              length += ts.length;
          }
        }
      }
      return { mode, indent, chomp, comment, length };
    }
    function splitLines(source) {
      const split = source.split(/\n( *)/);
      const first = split[0];
      const m = first.match(/^( *)/);
      const line0 = m?.[1] ? [m[1], first.slice(m[1].length)] : ["", first];
      const lines = [line0];
      for (let i = 1; i < split.length; i += 2)
        lines.push([split[i], split[i + 1]]);
      return lines;
    }
    exports.resolveBlockScalar = resolveBlockScalar;
  }
});

// node_modules/yaml/dist/compose/resolve-flow-scalar.js
var require_resolve_flow_scalar = __commonJS({
  "node_modules/yaml/dist/compose/resolve-flow-scalar.js"(exports) {
    "use strict";
    var Scalar = require_Scalar();
    var resolveEnd = require_resolve_end();
    function resolveFlowScalar(scalar, strict, onError) {
      const { offset, type, source, end } = scalar;
      let _type;
      let value;
      const _onError = (rel, code, msg) => onError(offset + rel, code, msg);
      switch (type) {
        case "scalar":
          _type = Scalar.Scalar.PLAIN;
          value = plainValue(source, _onError);
          break;
        case "single-quoted-scalar":
          _type = Scalar.Scalar.QUOTE_SINGLE;
          value = singleQuotedValue(source, _onError);
          break;
        case "double-quoted-scalar":
          _type = Scalar.Scalar.QUOTE_DOUBLE;
          value = doubleQuotedValue(source, _onError);
          break;
        /* istanbul ignore next should not happen */
        default:
          onError(scalar, "UNEXPECTED_TOKEN", `Expected a flow scalar value, but found: ${type}`);
          return {
            value: "",
            type: null,
            comment: "",
            range: [offset, offset + source.length, offset + source.length]
          };
      }
      const valueEnd = offset + source.length;
      const re = resolveEnd.resolveEnd(end, valueEnd, strict, onError);
      return {
        value,
        type: _type,
        comment: re.comment,
        range: [offset, valueEnd, re.offset]
      };
    }
    function plainValue(source, onError) {
      let badChar = "";
      switch (source[0]) {
        /* istanbul ignore next should not happen */
        case "	":
          badChar = "a tab character";
          break;
        case ",":
          badChar = "flow indicator character ,";
          break;
        case "%":
          badChar = "directive indicator character %";
          break;
        case "|":
        case ">": {
          badChar = `block scalar indicator ${source[0]}`;
          break;
        }
        case "@":
        case "`": {
          badChar = `reserved character ${source[0]}`;
          break;
        }
      }
      if (badChar)
        onError(0, "BAD_SCALAR_START", `Plain value cannot start with ${badChar}`);
      return unfoldLines(source);
    }
    function singleQuotedValue(source, onError) {
      if (source[source.length - 1] !== "'" || source.length === 1)
        onError(source.length, "MISSING_CHAR", "Missing closing 'quote");
      return unfoldLines(source.slice(1, -1)).replace(/''/g, "'");
    }
    function unfoldLines(source) {
      const line = /(.*?)\r?\n/sy;
      let match = line.exec(source);
      if (!match)
        return source;
      let trimEnd, trimBoth;
      try {
        trimEnd = new RegExp("(?<![ 	])[ 	]+$");
        trimBoth = new RegExp("^[ 	]+|(?<![ 	])[ 	]+$", "g");
      } catch {
        trimEnd = /[ \t]+$/;
        trimBoth = /^[ \t]+|[ \t]+$/g;
      }
      let res = match[1].replace(trimEnd, "");
      let sep3 = " ";
      let pos = line.lastIndex;
      while (match = line.exec(source)) {
        const lm = match[1].replace(trimBoth, "");
        if (lm === "") {
          if (sep3 === "\n")
            res += sep3;
          else
            sep3 = "\n";
        } else {
          res += sep3 + lm;
          sep3 = " ";
        }
        pos = line.lastIndex;
      }
      const last = /[ \t]*(.*)/sy;
      last.lastIndex = pos;
      match = last.exec(source);
      return res + sep3 + (match?.[1] ?? "");
    }
    function doubleQuotedValue(source, onError) {
      let res = "";
      for (let i = 1; i < source.length - 1; ++i) {
        const ch = source[i];
        if (ch === "\r" && source[i + 1] === "\n")
          continue;
        if (ch === "\n") {
          const { fold, offset } = foldNewline(source, i);
          res += fold;
          i = offset;
        } else if (ch === "\\") {
          let next = source[++i];
          const cc = escapeCodes[next];
          if (cc)
            res += cc;
          else if (next === "\n") {
            next = source[i + 1];
            while (next === " " || next === "	")
              next = source[++i + 1];
          } else if (next === "\r" && source[i + 1] === "\n") {
            next = source[++i + 1];
            while (next === " " || next === "	")
              next = source[++i + 1];
          } else if (next === "x" || next === "u" || next === "U") {
            const length = next === "x" ? 2 : next === "u" ? 4 : 8;
            res += parseCharCode(source, i + 1, length, onError);
            i += length;
          } else {
            const raw = source.substr(i - 1, 2);
            onError(i - 1, "BAD_DQ_ESCAPE", `Invalid escape sequence ${raw}`);
            res += raw;
          }
        } else if (ch === " " || ch === "	") {
          const wsStart = i;
          let next = source[i + 1];
          while (next === " " || next === "	")
            next = source[++i + 1];
          if (next !== "\n" && !(next === "\r" && source[i + 2] === "\n"))
            res += i > wsStart ? source.slice(wsStart, i + 1) : ch;
        } else {
          res += ch;
        }
      }
      if (source[source.length - 1] !== '"' || source.length === 1)
        onError(source.length, "MISSING_CHAR", 'Missing closing "quote');
      return res;
    }
    function foldNewline(source, offset) {
      let fold = "";
      let ch = source[offset + 1];
      while (ch === " " || ch === "	" || ch === "\n" || ch === "\r") {
        if (ch === "\r" && source[offset + 2] !== "\n")
          break;
        if (ch === "\n")
          fold += "\n";
        offset += 1;
        ch = source[offset + 1];
      }
      if (!fold)
        fold = " ";
      return { fold, offset };
    }
    var escapeCodes = {
      "0": "\0",
      // null character
      a: "\x07",
      // bell character
      b: "\b",
      // backspace
      e: "\x1B",
      // escape character
      f: "\f",
      // form feed
      n: "\n",
      // line feed
      r: "\r",
      // carriage return
      t: "	",
      // horizontal tab
      v: "\v",
      // vertical tab
      N: "",
      // Unicode next line
      _: " ",
      // Unicode non-breaking space
      L: "\u2028",
      // Unicode line separator
      P: "\u2029",
      // Unicode paragraph separator
      " ": " ",
      '"': '"',
      "/": "/",
      "\\": "\\",
      "	": "	"
    };
    function parseCharCode(source, offset, length, onError) {
      const cc = source.substr(offset, length);
      const ok = cc.length === length && /^[0-9a-fA-F]+$/.test(cc);
      const code = ok ? parseInt(cc, 16) : NaN;
      try {
        return String.fromCodePoint(code);
      } catch {
        const raw = source.substr(offset - 2, length + 2);
        onError(offset - 2, "BAD_DQ_ESCAPE", `Invalid escape sequence ${raw}`);
        return raw;
      }
    }
    exports.resolveFlowScalar = resolveFlowScalar;
  }
});

// node_modules/yaml/dist/compose/compose-scalar.js
var require_compose_scalar = __commonJS({
  "node_modules/yaml/dist/compose/compose-scalar.js"(exports) {
    "use strict";
    var identity = require_identity();
    var Scalar = require_Scalar();
    var resolveBlockScalar = require_resolve_block_scalar();
    var resolveFlowScalar = require_resolve_flow_scalar();
    function composeScalar(ctx, token, tagToken, onError) {
      const { value, type, comment, range } = token.type === "block-scalar" ? resolveBlockScalar.resolveBlockScalar(ctx, token, onError) : resolveFlowScalar.resolveFlowScalar(token, ctx.options.strict, onError);
      const tagName = tagToken ? ctx.directives.tagName(tagToken.source, (msg) => onError(tagToken, "TAG_RESOLVE_FAILED", msg)) : null;
      let tag;
      if (ctx.options.stringKeys && ctx.atKey) {
        tag = ctx.schema[identity.SCALAR];
      } else if (tagName)
        tag = findScalarTagByName(ctx.schema, value, tagName, tagToken, onError);
      else if (token.type === "scalar")
        tag = findScalarTagByTest(ctx, value, token, onError);
      else
        tag = ctx.schema[identity.SCALAR];
      let scalar;
      try {
        const res = tag.resolve(value, (msg) => onError(tagToken ?? token, "TAG_RESOLVE_FAILED", msg), ctx.options);
        scalar = identity.isScalar(res) ? res : new Scalar.Scalar(res);
      } catch (error) {
        const msg = error instanceof Error ? error.message : String(error);
        onError(tagToken ?? token, "TAG_RESOLVE_FAILED", msg);
        scalar = new Scalar.Scalar(value);
      }
      scalar.range = range;
      scalar.source = value;
      if (type)
        scalar.type = type;
      if (tagName)
        scalar.tag = tagName;
      if (tag.format)
        scalar.format = tag.format;
      if (comment)
        scalar.comment = comment;
      return scalar;
    }
    function findScalarTagByName(schema, value, tagName, tagToken, onError) {
      if (tagName === "!")
        return schema[identity.SCALAR];
      const matchWithTest = [];
      for (const tag of schema.tags) {
        if (!tag.collection && tag.tag === tagName) {
          if (tag.default && tag.test)
            matchWithTest.push(tag);
          else
            return tag;
        }
      }
      for (const tag of matchWithTest)
        if (tag.test?.test(value))
          return tag;
      const kt = schema.knownTags[tagName];
      if (kt && !kt.collection) {
        schema.tags.push(Object.assign({}, kt, { default: false, test: void 0 }));
        return kt;
      }
      onError(tagToken, "TAG_RESOLVE_FAILED", `Unresolved tag: ${tagName}`, tagName !== "tag:yaml.org,2002:str");
      return schema[identity.SCALAR];
    }
    function findScalarTagByTest({ atKey, directives, schema }, value, token, onError) {
      const tag = schema.tags.find((tag2) => (tag2.default === true || atKey && tag2.default === "key") && tag2.test?.test(value)) || schema[identity.SCALAR];
      if (schema.compat) {
        const compat = schema.compat.find((tag2) => tag2.default && tag2.test?.test(value)) ?? schema[identity.SCALAR];
        if (tag.tag !== compat.tag) {
          const ts = directives.tagString(tag.tag);
          const cs = directives.tagString(compat.tag);
          const msg = `Value may be parsed as either ${ts} or ${cs}`;
          onError(token, "TAG_RESOLVE_FAILED", msg, true);
        }
      }
      return tag;
    }
    exports.composeScalar = composeScalar;
  }
});

// node_modules/yaml/dist/compose/util-empty-scalar-position.js
var require_util_empty_scalar_position = __commonJS({
  "node_modules/yaml/dist/compose/util-empty-scalar-position.js"(exports) {
    "use strict";
    function emptyScalarPosition(offset, before, pos) {
      if (before) {
        pos ?? (pos = before.length);
        for (let i = pos - 1; i >= 0; --i) {
          let st = before[i];
          switch (st.type) {
            case "space":
            case "comment":
            case "newline":
              offset -= st.source.length;
              continue;
          }
          st = before[++i];
          while (st?.type === "space") {
            offset += st.source.length;
            st = before[++i];
          }
          break;
        }
      }
      return offset;
    }
    exports.emptyScalarPosition = emptyScalarPosition;
  }
});

// node_modules/yaml/dist/compose/compose-node.js
var require_compose_node = __commonJS({
  "node_modules/yaml/dist/compose/compose-node.js"(exports) {
    "use strict";
    var Alias = require_Alias();
    var identity = require_identity();
    var composeCollection = require_compose_collection();
    var composeScalar = require_compose_scalar();
    var resolveEnd = require_resolve_end();
    var utilEmptyScalarPosition = require_util_empty_scalar_position();
    var CN = { composeNode, composeEmptyNode };
    function composeNode(ctx, token, props, onError) {
      const atKey = ctx.atKey;
      const { spaceBefore, comment, anchor, tag } = props;
      let node;
      let isSrcToken = true;
      switch (token.type) {
        case "alias":
          node = composeAlias(ctx, token, onError);
          if (anchor || tag)
            onError(token, "ALIAS_PROPS", "An alias node must not specify any properties");
          break;
        case "scalar":
        case "single-quoted-scalar":
        case "double-quoted-scalar":
        case "block-scalar":
          node = composeScalar.composeScalar(ctx, token, tag, onError);
          if (anchor)
            node.anchor = anchor.source.substring(1);
          break;
        case "block-map":
        case "block-seq":
        case "flow-collection":
          try {
            node = composeCollection.composeCollection(CN, ctx, token, props, onError);
            if (anchor)
              node.anchor = anchor.source.substring(1);
          } catch (error) {
            const message = error instanceof Error ? error.message : String(error);
            onError(token, "RESOURCE_EXHAUSTION", message);
          }
          break;
        default: {
          const message = token.type === "error" ? token.message : `Unsupported token (type: ${token.type})`;
          onError(token, "UNEXPECTED_TOKEN", message);
          isSrcToken = false;
        }
      }
      node ?? (node = composeEmptyNode(ctx, token.offset, void 0, null, props, onError));
      if (anchor && node.anchor === "")
        onError(anchor, "BAD_ALIAS", "Anchor cannot be an empty string");
      if (atKey && ctx.options.stringKeys && (!identity.isScalar(node) || typeof node.value !== "string" || node.tag && node.tag !== "tag:yaml.org,2002:str")) {
        const msg = "With stringKeys, all keys must be strings";
        onError(tag ?? token, "NON_STRING_KEY", msg);
      }
      if (spaceBefore)
        node.spaceBefore = true;
      if (comment) {
        if (token.type === "scalar" && token.source === "")
          node.comment = comment;
        else
          node.commentBefore = comment;
      }
      if (ctx.options.keepSourceTokens && isSrcToken)
        node.srcToken = token;
      return node;
    }
    function composeEmptyNode(ctx, offset, before, pos, { spaceBefore, comment, anchor, tag, end }, onError) {
      const token = {
        type: "scalar",
        offset: utilEmptyScalarPosition.emptyScalarPosition(offset, before, pos),
        indent: -1,
        source: ""
      };
      const node = composeScalar.composeScalar(ctx, token, tag, onError);
      if (anchor) {
        node.anchor = anchor.source.substring(1);
        if (node.anchor === "")
          onError(anchor, "BAD_ALIAS", "Anchor cannot be an empty string");
      }
      if (spaceBefore)
        node.spaceBefore = true;
      if (comment) {
        node.comment = comment;
        node.range[2] = end;
      }
      return node;
    }
    function composeAlias({ options }, { offset, source, end }, onError) {
      const alias = new Alias.Alias(source.substring(1));
      if (alias.source === "")
        onError(offset, "BAD_ALIAS", "Alias cannot be an empty string");
      if (alias.source.endsWith(":"))
        onError(offset + source.length - 1, "BAD_ALIAS", "Alias ending in : is ambiguous", true);
      const valueEnd = offset + source.length;
      const re = resolveEnd.resolveEnd(end, valueEnd, options.strict, onError);
      alias.range = [offset, valueEnd, re.offset];
      if (re.comment)
        alias.comment = re.comment;
      return alias;
    }
    exports.composeEmptyNode = composeEmptyNode;
    exports.composeNode = composeNode;
  }
});

// node_modules/yaml/dist/compose/compose-doc.js
var require_compose_doc = __commonJS({
  "node_modules/yaml/dist/compose/compose-doc.js"(exports) {
    "use strict";
    var Document = require_Document();
    var composeNode = require_compose_node();
    var resolveEnd = require_resolve_end();
    var resolveProps = require_resolve_props();
    function composeDoc(options, directives, { offset, start, value, end }, onError) {
      const opts = Object.assign({ _directives: directives }, options);
      const doc = new Document.Document(void 0, opts);
      const ctx = {
        atKey: false,
        atRoot: true,
        directives: doc.directives,
        options: doc.options,
        schema: doc.schema
      };
      const props = resolveProps.resolveProps(start, {
        indicator: "doc-start",
        next: value ?? end?.[0],
        offset,
        onError,
        parentIndent: 0,
        startOnNewline: true
      });
      if (props.found) {
        doc.directives.docStart = true;
        if (value && (value.type === "block-map" || value.type === "block-seq") && !props.hasNewline)
          onError(props.end, "MISSING_CHAR", "Block collection cannot start on same line with directives-end marker");
      }
      doc.contents = value ? composeNode.composeNode(ctx, value, props, onError) : composeNode.composeEmptyNode(ctx, props.end, start, null, props, onError);
      const contentEnd = doc.contents.range[2];
      const re = resolveEnd.resolveEnd(end, contentEnd, false, onError);
      if (re.comment)
        doc.comment = re.comment;
      doc.range = [offset, contentEnd, re.offset];
      return doc;
    }
    exports.composeDoc = composeDoc;
  }
});

// node_modules/yaml/dist/compose/composer.js
var require_composer = __commonJS({
  "node_modules/yaml/dist/compose/composer.js"(exports) {
    "use strict";
    var node_process = __require("process");
    var directives = require_directives();
    var Document = require_Document();
    var errors = require_errors();
    var identity = require_identity();
    var composeDoc = require_compose_doc();
    var resolveEnd = require_resolve_end();
    function getErrorPos(src) {
      if (typeof src === "number")
        return [src, src + 1];
      if (Array.isArray(src))
        return src.length === 2 ? src : [src[0], src[1]];
      const { offset, source } = src;
      return [offset, offset + (typeof source === "string" ? source.length : 1)];
    }
    function parsePrelude(prelude) {
      let comment = "";
      let atComment = false;
      let afterEmptyLine = false;
      for (let i = 0; i < prelude.length; ++i) {
        const source = prelude[i];
        switch (source[0]) {
          case "#":
            comment += (comment === "" ? "" : afterEmptyLine ? "\n\n" : "\n") + (source.substring(1) || " ");
            atComment = true;
            afterEmptyLine = false;
            break;
          case "%":
            if (prelude[i + 1]?.[0] !== "#")
              i += 1;
            atComment = false;
            break;
          default:
            if (!atComment)
              afterEmptyLine = true;
            atComment = false;
        }
      }
      return { comment, afterEmptyLine };
    }
    var Composer = class {
      constructor(options = {}) {
        this.doc = null;
        this.atDirectives = false;
        this.prelude = [];
        this.errors = [];
        this.warnings = [];
        this.onError = (source, code, message, warning) => {
          const pos = getErrorPos(source);
          if (warning)
            this.warnings.push(new errors.YAMLWarning(pos, code, message));
          else
            this.errors.push(new errors.YAMLParseError(pos, code, message));
        };
        this.directives = new directives.Directives({ version: options.version || "1.2" });
        this.options = options;
      }
      decorate(doc, afterDoc) {
        const { comment, afterEmptyLine } = parsePrelude(this.prelude);
        if (comment) {
          const dc = doc.contents;
          if (afterDoc) {
            doc.comment = doc.comment ? `${doc.comment}
${comment}` : comment;
          } else if (afterEmptyLine || doc.directives.docStart || !dc) {
            doc.commentBefore = comment;
          } else if (identity.isCollection(dc) && !dc.flow && dc.items.length > 0) {
            let it = dc.items[0];
            if (identity.isPair(it))
              it = it.key;
            const cb = it.commentBefore;
            it.commentBefore = cb ? `${comment}
${cb}` : comment;
          } else {
            const cb = dc.commentBefore;
            dc.commentBefore = cb ? `${comment}
${cb}` : comment;
          }
        }
        if (afterDoc) {
          for (let i = 0; i < this.errors.length; ++i)
            doc.errors.push(this.errors[i]);
          for (let i = 0; i < this.warnings.length; ++i)
            doc.warnings.push(this.warnings[i]);
        } else {
          doc.errors = this.errors;
          doc.warnings = this.warnings;
        }
        this.prelude = [];
        this.errors = [];
        this.warnings = [];
      }
      /**
       * Current stream status information.
       *
       * Mostly useful at the end of input for an empty stream.
       */
      streamInfo() {
        return {
          comment: parsePrelude(this.prelude).comment,
          directives: this.directives,
          errors: this.errors,
          warnings: this.warnings
        };
      }
      /**
       * Compose tokens into documents.
       *
       * @param forceDoc - If the stream contains no document, still emit a final document including any comments and directives that would be applied to a subsequent document.
       * @param endOffset - Should be set if `forceDoc` is also set, to set the document range end and to indicate errors correctly.
       */
      *compose(tokens, forceDoc = false, endOffset = -1) {
        for (const token of tokens)
          yield* this.next(token);
        yield* this.end(forceDoc, endOffset);
      }
      /** Advance the composer by one CST token. */
      *next(token) {
        if (node_process.env.LOG_STREAM)
          console.dir(token, { depth: null });
        switch (token.type) {
          case "directive":
            this.directives.add(token.source, (offset, message, warning) => {
              const pos = getErrorPos(token);
              pos[0] += offset;
              this.onError(pos, "BAD_DIRECTIVE", message, warning);
            });
            this.prelude.push(token.source);
            this.atDirectives = true;
            break;
          case "document": {
            const doc = composeDoc.composeDoc(this.options, this.directives, token, this.onError);
            if (this.atDirectives && !doc.directives.docStart)
              this.onError(token, "MISSING_CHAR", "Missing directives-end/doc-start indicator line");
            this.decorate(doc, false);
            if (this.doc)
              yield this.doc;
            this.doc = doc;
            this.atDirectives = false;
            break;
          }
          case "byte-order-mark":
          case "space":
            break;
          case "comment":
          case "newline":
            this.prelude.push(token.source);
            break;
          case "error": {
            const msg = token.source ? `${token.message}: ${JSON.stringify(token.source)}` : token.message;
            const error = new errors.YAMLParseError(getErrorPos(token), "UNEXPECTED_TOKEN", msg);
            if (this.atDirectives || !this.doc)
              this.errors.push(error);
            else
              this.doc.errors.push(error);
            break;
          }
          case "doc-end": {
            if (!this.doc) {
              const msg = "Unexpected doc-end without preceding document";
              this.errors.push(new errors.YAMLParseError(getErrorPos(token), "UNEXPECTED_TOKEN", msg));
              break;
            }
            this.doc.directives.docEnd = true;
            const end = resolveEnd.resolveEnd(token.end, token.offset + token.source.length, this.doc.options.strict, this.onError);
            this.decorate(this.doc, true);
            if (end.comment) {
              const dc = this.doc.comment;
              this.doc.comment = dc ? `${dc}
${end.comment}` : end.comment;
            }
            this.doc.range[2] = end.offset;
            break;
          }
          default:
            this.errors.push(new errors.YAMLParseError(getErrorPos(token), "UNEXPECTED_TOKEN", `Unsupported token ${token.type}`));
        }
      }
      /**
       * Call at end of input to yield any remaining document.
       *
       * @param forceDoc - If the stream contains no document, still emit a final document including any comments and directives that would be applied to a subsequent document.
       * @param endOffset - Should be set if `forceDoc` is also set, to set the document range end and to indicate errors correctly.
       */
      *end(forceDoc = false, endOffset = -1) {
        if (this.doc) {
          this.decorate(this.doc, true);
          yield this.doc;
          this.doc = null;
        } else if (forceDoc) {
          const opts = Object.assign({ _directives: this.directives }, this.options);
          const doc = new Document.Document(void 0, opts);
          if (this.atDirectives)
            this.onError(endOffset, "MISSING_CHAR", "Missing directives-end indicator line");
          doc.range = [0, endOffset, endOffset];
          this.decorate(doc, false);
          yield doc;
        }
      }
    };
    exports.Composer = Composer;
  }
});

// node_modules/yaml/dist/parse/cst-scalar.js
var require_cst_scalar = __commonJS({
  "node_modules/yaml/dist/parse/cst-scalar.js"(exports) {
    "use strict";
    var resolveBlockScalar = require_resolve_block_scalar();
    var resolveFlowScalar = require_resolve_flow_scalar();
    var errors = require_errors();
    var stringifyString = require_stringifyString();
    function resolveAsScalar(token, strict = true, onError) {
      if (token) {
        const _onError = (pos, code, message) => {
          const offset = typeof pos === "number" ? pos : Array.isArray(pos) ? pos[0] : pos.offset;
          if (onError)
            onError(offset, code, message);
          else
            throw new errors.YAMLParseError([offset, offset + 1], code, message);
        };
        switch (token.type) {
          case "scalar":
          case "single-quoted-scalar":
          case "double-quoted-scalar":
            return resolveFlowScalar.resolveFlowScalar(token, strict, _onError);
          case "block-scalar":
            return resolveBlockScalar.resolveBlockScalar({ options: { strict } }, token, _onError);
        }
      }
      return null;
    }
    function createScalarToken(value, context) {
      const { implicitKey = false, indent, inFlow = false, offset = -1, type = "PLAIN" } = context;
      const source = stringifyString.stringifyString({ type, value }, {
        implicitKey,
        indent: indent > 0 ? " ".repeat(indent) : "",
        inFlow,
        options: { blockQuote: true, lineWidth: -1 }
      });
      const end = context.end ?? [
        { type: "newline", offset: -1, indent, source: "\n" }
      ];
      switch (source[0]) {
        case "|":
        case ">": {
          const he = source.indexOf("\n");
          const head = source.substring(0, he);
          const body = source.substring(he + 1) + "\n";
          const props = [
            { type: "block-scalar-header", offset, indent, source: head }
          ];
          if (!addEndtoBlockProps(props, end))
            props.push({ type: "newline", offset: -1, indent, source: "\n" });
          return { type: "block-scalar", offset, indent, props, source: body };
        }
        case '"':
          return { type: "double-quoted-scalar", offset, indent, source, end };
        case "'":
          return { type: "single-quoted-scalar", offset, indent, source, end };
        default:
          return { type: "scalar", offset, indent, source, end };
      }
    }
    function setScalarValue(token, value, context = {}) {
      let { afterKey = false, implicitKey = false, inFlow = false, type } = context;
      let indent = "indent" in token ? token.indent : null;
      if (afterKey && typeof indent === "number")
        indent += 2;
      if (!type)
        switch (token.type) {
          case "single-quoted-scalar":
            type = "QUOTE_SINGLE";
            break;
          case "double-quoted-scalar":
            type = "QUOTE_DOUBLE";
            break;
          case "block-scalar": {
            const header = token.props[0];
            if (header.type !== "block-scalar-header")
              throw new Error("Invalid block scalar header");
            type = header.source[0] === ">" ? "BLOCK_FOLDED" : "BLOCK_LITERAL";
            break;
          }
          default:
            type = "PLAIN";
        }
      const source = stringifyString.stringifyString({ type, value }, {
        implicitKey: implicitKey || indent === null,
        indent: indent !== null && indent > 0 ? " ".repeat(indent) : "",
        inFlow,
        options: { blockQuote: true, lineWidth: -1 }
      });
      switch (source[0]) {
        case "|":
        case ">":
          setBlockScalarValue(token, source);
          break;
        case '"':
          setFlowScalarValue(token, source, "double-quoted-scalar");
          break;
        case "'":
          setFlowScalarValue(token, source, "single-quoted-scalar");
          break;
        default:
          setFlowScalarValue(token, source, "scalar");
      }
    }
    function setBlockScalarValue(token, source) {
      const he = source.indexOf("\n");
      const head = source.substring(0, he);
      const body = source.substring(he + 1) + "\n";
      if (token.type === "block-scalar") {
        const header = token.props[0];
        if (header.type !== "block-scalar-header")
          throw new Error("Invalid block scalar header");
        header.source = head;
        token.source = body;
      } else {
        const { offset } = token;
        const indent = "indent" in token ? token.indent : -1;
        const props = [
          { type: "block-scalar-header", offset, indent, source: head }
        ];
        if (!addEndtoBlockProps(props, "end" in token ? token.end : void 0))
          props.push({ type: "newline", offset: -1, indent, source: "\n" });
        for (const key of Object.keys(token))
          if (key !== "type" && key !== "offset")
            delete token[key];
        Object.assign(token, { type: "block-scalar", indent, props, source: body });
      }
    }
    function addEndtoBlockProps(props, end) {
      if (end)
        for (const st of end)
          switch (st.type) {
            case "space":
            case "comment":
              props.push(st);
              break;
            case "newline":
              props.push(st);
              return true;
          }
      return false;
    }
    function setFlowScalarValue(token, source, type) {
      switch (token.type) {
        case "scalar":
        case "double-quoted-scalar":
        case "single-quoted-scalar":
          token.type = type;
          token.source = source;
          break;
        case "block-scalar": {
          const end = token.props.slice(1);
          let oa = source.length;
          if (token.props[0].type === "block-scalar-header")
            oa -= token.props[0].source.length;
          for (const tok of end)
            tok.offset += oa;
          delete token.props;
          Object.assign(token, { type, source, end });
          break;
        }
        case "block-map":
        case "block-seq": {
          const offset = token.offset + source.length;
          const nl = { type: "newline", offset, indent: token.indent, source: "\n" };
          delete token.items;
          Object.assign(token, { type, source, end: [nl] });
          break;
        }
        default: {
          const indent = "indent" in token ? token.indent : -1;
          const end = "end" in token && Array.isArray(token.end) ? token.end.filter((st) => st.type === "space" || st.type === "comment" || st.type === "newline") : [];
          for (const key of Object.keys(token))
            if (key !== "type" && key !== "offset")
              delete token[key];
          Object.assign(token, { type, indent, source, end });
        }
      }
    }
    exports.createScalarToken = createScalarToken;
    exports.resolveAsScalar = resolveAsScalar;
    exports.setScalarValue = setScalarValue;
  }
});

// node_modules/yaml/dist/parse/cst-stringify.js
var require_cst_stringify = __commonJS({
  "node_modules/yaml/dist/parse/cst-stringify.js"(exports) {
    "use strict";
    var stringify = (cst) => "type" in cst ? stringifyToken(cst) : stringifyItem(cst);
    function stringifyToken(token) {
      switch (token.type) {
        case "block-scalar": {
          let res = "";
          for (const tok of token.props)
            res += stringifyToken(tok);
          return res + token.source;
        }
        case "block-map":
        case "block-seq": {
          let res = "";
          for (const item of token.items)
            res += stringifyItem(item);
          return res;
        }
        case "flow-collection": {
          let res = token.start.source;
          for (const item of token.items)
            res += stringifyItem(item);
          for (const st of token.end)
            res += st.source;
          return res;
        }
        case "document": {
          let res = stringifyItem(token);
          if (token.end)
            for (const st of token.end)
              res += st.source;
          return res;
        }
        default: {
          let res = token.source;
          if ("end" in token && token.end)
            for (const st of token.end)
              res += st.source;
          return res;
        }
      }
    }
    function stringifyItem({ start, key, sep: sep3, value }) {
      let res = "";
      for (const st of start)
        res += st.source;
      if (key)
        res += stringifyToken(key);
      if (sep3)
        for (const st of sep3)
          res += st.source;
      if (value)
        res += stringifyToken(value);
      return res;
    }
    exports.stringify = stringify;
  }
});

// node_modules/yaml/dist/parse/cst-visit.js
var require_cst_visit = __commonJS({
  "node_modules/yaml/dist/parse/cst-visit.js"(exports) {
    "use strict";
    var BREAK = /* @__PURE__ */ Symbol("break visit");
    var SKIP = /* @__PURE__ */ Symbol("skip children");
    var REMOVE = /* @__PURE__ */ Symbol("remove item");
    function visit3(cst, visitor) {
      if ("type" in cst && cst.type === "document")
        cst = { start: cst.start, value: cst.value };
      _visit(Object.freeze([]), cst, visitor);
    }
    visit3.BREAK = BREAK;
    visit3.SKIP = SKIP;
    visit3.REMOVE = REMOVE;
    visit3.itemAtPath = (cst, path) => {
      let item = cst;
      for (const [field, index] of path) {
        const tok = item?.[field];
        if (tok && "items" in tok) {
          item = tok.items[index];
        } else
          return void 0;
      }
      return item;
    };
    visit3.parentCollection = (cst, path) => {
      const parent = visit3.itemAtPath(cst, path.slice(0, -1));
      const field = path[path.length - 1][0];
      const coll = parent?.[field];
      if (coll && "items" in coll)
        return coll;
      throw new Error("Parent collection not found");
    };
    function _visit(path, item, visitor) {
      let ctrl = visitor(item, path);
      if (typeof ctrl === "symbol")
        return ctrl;
      for (const field of ["key", "value"]) {
        const token = item[field];
        if (token && "items" in token) {
          for (let i = 0; i < token.items.length; ++i) {
            const ci = _visit(Object.freeze(path.concat([[field, i]])), token.items[i], visitor);
            if (typeof ci === "number")
              i = ci - 1;
            else if (ci === BREAK)
              return BREAK;
            else if (ci === REMOVE) {
              token.items.splice(i, 1);
              i -= 1;
            }
          }
          if (typeof ctrl === "function" && field === "key")
            ctrl = ctrl(item, path);
        }
      }
      return typeof ctrl === "function" ? ctrl(item, path) : ctrl;
    }
    exports.visit = visit3;
  }
});

// node_modules/yaml/dist/parse/cst.js
var require_cst = __commonJS({
  "node_modules/yaml/dist/parse/cst.js"(exports) {
    "use strict";
    var cstScalar = require_cst_scalar();
    var cstStringify = require_cst_stringify();
    var cstVisit = require_cst_visit();
    var BOM = "\uFEFF";
    var DOCUMENT = "";
    var FLOW_END = "";
    var SCALAR = "";
    var isCollection2 = (token) => !!token && "items" in token;
    var isScalar6 = (token) => !!token && (token.type === "scalar" || token.type === "single-quoted-scalar" || token.type === "double-quoted-scalar" || token.type === "block-scalar");
    function prettyToken(token) {
      switch (token) {
        case BOM:
          return "<BOM>";
        case DOCUMENT:
          return "<DOC>";
        case FLOW_END:
          return "<FLOW_END>";
        case SCALAR:
          return "<SCALAR>";
        default:
          return JSON.stringify(token);
      }
    }
    function tokenType(source) {
      switch (source) {
        case BOM:
          return "byte-order-mark";
        case DOCUMENT:
          return "doc-mode";
        case FLOW_END:
          return "flow-error-end";
        case SCALAR:
          return "scalar";
        case "---":
          return "doc-start";
        case "...":
          return "doc-end";
        case "":
        case "\n":
        case "\r\n":
          return "newline";
        case "-":
          return "seq-item-ind";
        case "?":
          return "explicit-key-ind";
        case ":":
          return "map-value-ind";
        case "{":
          return "flow-map-start";
        case "}":
          return "flow-map-end";
        case "[":
          return "flow-seq-start";
        case "]":
          return "flow-seq-end";
        case ",":
          return "comma";
      }
      switch (source[0]) {
        case " ":
        case "	":
          return "space";
        case "#":
          return "comment";
        case "%":
          return "directive-line";
        case "*":
          return "alias";
        case "&":
          return "anchor";
        case "!":
          return "tag";
        case "'":
          return "single-quoted-scalar";
        case '"':
          return "double-quoted-scalar";
        case "|":
        case ">":
          return "block-scalar-header";
      }
      return null;
    }
    exports.createScalarToken = cstScalar.createScalarToken;
    exports.resolveAsScalar = cstScalar.resolveAsScalar;
    exports.setScalarValue = cstScalar.setScalarValue;
    exports.stringify = cstStringify.stringify;
    exports.visit = cstVisit.visit;
    exports.BOM = BOM;
    exports.DOCUMENT = DOCUMENT;
    exports.FLOW_END = FLOW_END;
    exports.SCALAR = SCALAR;
    exports.isCollection = isCollection2;
    exports.isScalar = isScalar6;
    exports.prettyToken = prettyToken;
    exports.tokenType = tokenType;
  }
});

// node_modules/yaml/dist/parse/lexer.js
var require_lexer = __commonJS({
  "node_modules/yaml/dist/parse/lexer.js"(exports) {
    "use strict";
    var cst = require_cst();
    function isEmpty(ch) {
      switch (ch) {
        case void 0:
        case " ":
        case "\n":
        case "\r":
        case "	":
          return true;
        default:
          return false;
      }
    }
    var hexDigits = new Set("0123456789ABCDEFabcdef");
    var tagChars = new Set("0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz-#;/?:@&=+$_.!~*'()");
    var flowIndicatorChars = new Set(",[]{}");
    var invalidAnchorChars = new Set(" ,[]{}\n\r	");
    var isNotAnchorChar = (ch) => !ch || invalidAnchorChars.has(ch);
    var Lexer = class {
      constructor() {
        this.atEnd = false;
        this.blockScalarIndent = -1;
        this.blockScalarKeep = false;
        this.buffer = "";
        this.flowKey = false;
        this.flowLevel = 0;
        this.indentNext = 0;
        this.indentValue = 0;
        this.lineEndPos = null;
        this.next = null;
        this.pos = 0;
      }
      /**
       * Generate YAML tokens from the `source` string. If `incomplete`,
       * a part of the last line may be left as a buffer for the next call.
       *
       * @returns A generator of lexical tokens
       */
      *lex(source, incomplete = false) {
        if (source) {
          if (typeof source !== "string")
            throw TypeError("source is not a string");
          this.buffer = this.buffer ? this.buffer + source : source;
          this.lineEndPos = null;
        }
        this.atEnd = !incomplete;
        let next = this.next ?? "stream";
        while (next && (incomplete || this.hasChars(1)))
          next = yield* this.parseNext(next);
      }
      atLineEnd() {
        let i = this.pos;
        let ch = this.buffer[i];
        while (ch === " " || ch === "	")
          ch = this.buffer[++i];
        if (!ch || ch === "#" || ch === "\n")
          return true;
        if (ch === "\r")
          return this.buffer[i + 1] === "\n";
        return false;
      }
      charAt(n) {
        return this.buffer[this.pos + n];
      }
      continueScalar(offset) {
        let ch = this.buffer[offset];
        if (this.indentNext > 0) {
          let indent = 0;
          while (ch === " ")
            ch = this.buffer[++indent + offset];
          if (ch === "\r") {
            const next = this.buffer[indent + offset + 1];
            if (next === "\n" || !next && !this.atEnd)
              return offset + indent + 1;
          }
          return ch === "\n" || indent >= this.indentNext || !ch && !this.atEnd ? offset + indent : -1;
        }
        if (ch === "-" || ch === ".") {
          const dt = this.buffer.substr(offset, 3);
          if ((dt === "---" || dt === "...") && isEmpty(this.buffer[offset + 3]))
            return -1;
        }
        return offset;
      }
      getLine() {
        let end = this.lineEndPos;
        if (typeof end !== "number" || end !== -1 && end < this.pos) {
          end = this.buffer.indexOf("\n", this.pos);
          this.lineEndPos = end;
        }
        if (end === -1)
          return this.atEnd ? this.buffer.substring(this.pos) : null;
        if (this.buffer[end - 1] === "\r")
          end -= 1;
        return this.buffer.substring(this.pos, end);
      }
      hasChars(n) {
        return this.pos + n <= this.buffer.length;
      }
      setNext(state) {
        this.buffer = this.buffer.substring(this.pos);
        this.pos = 0;
        this.lineEndPos = null;
        this.next = state;
        return null;
      }
      peek(n) {
        return this.buffer.substr(this.pos, n);
      }
      *parseNext(next) {
        switch (next) {
          case "stream":
            return yield* this.parseStream();
          case "line-start":
            return yield* this.parseLineStart();
          case "block-start":
            return yield* this.parseBlockStart();
          case "doc":
            return yield* this.parseDocument();
          case "flow":
            return yield* this.parseFlowCollection();
          case "quoted-scalar":
            return yield* this.parseQuotedScalar();
          case "block-scalar":
            return yield* this.parseBlockScalar();
          case "plain-scalar":
            return yield* this.parsePlainScalar();
        }
      }
      *parseStream() {
        let line = this.getLine();
        if (line === null)
          return this.setNext("stream");
        if (line[0] === cst.BOM) {
          yield* this.pushCount(1);
          line = line.substring(1);
        }
        if (line[0] === "%") {
          let dirEnd = line.length;
          let cs = line.indexOf("#");
          while (cs !== -1) {
            const ch = line[cs - 1];
            if (ch === " " || ch === "	") {
              dirEnd = cs - 1;
              break;
            } else {
              cs = line.indexOf("#", cs + 1);
            }
          }
          while (true) {
            const ch = line[dirEnd - 1];
            if (ch === " " || ch === "	")
              dirEnd -= 1;
            else
              break;
          }
          const n = (yield* this.pushCount(dirEnd)) + (yield* this.pushSpaces(true));
          yield* this.pushCount(line.length - n);
          this.pushNewline();
          return "stream";
        }
        if (this.atLineEnd()) {
          const sp = yield* this.pushSpaces(true);
          yield* this.pushCount(line.length - sp);
          yield* this.pushNewline();
          return "stream";
        }
        yield cst.DOCUMENT;
        return yield* this.parseLineStart();
      }
      *parseLineStart() {
        const ch = this.charAt(0);
        if (!ch && !this.atEnd)
          return this.setNext("line-start");
        if (ch === "-" || ch === ".") {
          if (!this.atEnd && !this.hasChars(4))
            return this.setNext("line-start");
          const s = this.peek(3);
          if ((s === "---" || s === "...") && isEmpty(this.charAt(3))) {
            yield* this.pushCount(3);
            this.indentValue = 0;
            this.indentNext = 0;
            return s === "---" ? "doc" : "stream";
          }
        }
        this.indentValue = yield* this.pushSpaces(false);
        if (this.indentNext > this.indentValue && !isEmpty(this.charAt(1)))
          this.indentNext = this.indentValue;
        return yield* this.parseBlockStart();
      }
      *parseBlockStart() {
        const [ch0, ch1] = this.peek(2);
        if (!ch1 && !this.atEnd)
          return this.setNext("block-start");
        if ((ch0 === "-" || ch0 === "?" || ch0 === ":") && isEmpty(ch1)) {
          const n = (yield* this.pushCount(1)) + (yield* this.pushSpaces(true));
          this.indentNext = this.indentValue + 1;
          this.indentValue += n;
          return "block-start";
        }
        return "doc";
      }
      *parseDocument() {
        yield* this.pushSpaces(true);
        const line = this.getLine();
        if (line === null)
          return this.setNext("doc");
        let n = yield* this.pushIndicators();
        switch (line[n]) {
          case "#":
            yield* this.pushCount(line.length - n);
          // fallthrough
          case void 0:
            yield* this.pushNewline();
            return yield* this.parseLineStart();
          case "{":
          case "[":
            yield* this.pushCount(1);
            this.flowKey = false;
            this.flowLevel = 1;
            return "flow";
          case "}":
          case "]":
            yield* this.pushCount(1);
            return "doc";
          case "*":
            yield* this.pushUntil(isNotAnchorChar);
            return "doc";
          case '"':
          case "'":
            return yield* this.parseQuotedScalar();
          case "|":
          case ">":
            n += yield* this.parseBlockScalarHeader();
            n += yield* this.pushSpaces(true);
            yield* this.pushCount(line.length - n);
            yield* this.pushNewline();
            return yield* this.parseBlockScalar();
          default:
            return yield* this.parsePlainScalar();
        }
      }
      *parseFlowCollection() {
        let nl, sp;
        let indent = -1;
        do {
          nl = yield* this.pushNewline();
          if (nl > 0) {
            sp = yield* this.pushSpaces(false);
            this.indentValue = indent = sp;
          } else {
            sp = 0;
          }
          sp += yield* this.pushSpaces(true);
        } while (nl + sp > 0);
        const line = this.getLine();
        if (line === null)
          return this.setNext("flow");
        if (indent !== -1 && indent < this.indentNext && line[0] !== "#" || indent === 0 && (line.startsWith("---") || line.startsWith("...")) && isEmpty(line[3])) {
          const atFlowEndMarker = indent === this.indentNext - 1 && this.flowLevel === 1 && (line[0] === "]" || line[0] === "}");
          if (!atFlowEndMarker) {
            this.flowLevel = 0;
            yield cst.FLOW_END;
            return yield* this.parseLineStart();
          }
        }
        let n = 0;
        while (line[n] === ",") {
          n += yield* this.pushCount(1);
          n += yield* this.pushSpaces(true);
          this.flowKey = false;
        }
        n += yield* this.pushIndicators();
        switch (line[n]) {
          case void 0:
            return "flow";
          case "#":
            yield* this.pushCount(line.length - n);
            return "flow";
          case "{":
          case "[":
            yield* this.pushCount(1);
            this.flowKey = false;
            this.flowLevel += 1;
            return "flow";
          case "}":
          case "]":
            yield* this.pushCount(1);
            this.flowKey = true;
            this.flowLevel -= 1;
            return this.flowLevel ? "flow" : "doc";
          case "*":
            yield* this.pushUntil(isNotAnchorChar);
            return "flow";
          case '"':
          case "'":
            this.flowKey = true;
            return yield* this.parseQuotedScalar();
          case ":": {
            const next = this.charAt(1);
            if (this.flowKey || isEmpty(next) || next === ",") {
              this.flowKey = false;
              yield* this.pushCount(1);
              yield* this.pushSpaces(true);
              return "flow";
            }
          }
          // fallthrough
          default:
            this.flowKey = false;
            return yield* this.parsePlainScalar();
        }
      }
      *parseQuotedScalar() {
        const quote = this.charAt(0);
        let end = this.buffer.indexOf(quote, this.pos + 1);
        if (quote === "'") {
          while (end !== -1 && this.buffer[end + 1] === "'")
            end = this.buffer.indexOf("'", end + 2);
        } else {
          while (end !== -1) {
            let n = 0;
            while (this.buffer[end - 1 - n] === "\\")
              n += 1;
            if (n % 2 === 0)
              break;
            end = this.buffer.indexOf('"', end + 1);
          }
        }
        const qb = this.buffer.substring(0, end);
        let nl = qb.indexOf("\n", this.pos);
        if (nl !== -1) {
          while (nl !== -1) {
            const cs = this.continueScalar(nl + 1);
            if (cs === -1)
              break;
            nl = qb.indexOf("\n", cs);
          }
          if (nl !== -1) {
            end = nl - (qb[nl - 1] === "\r" ? 2 : 1);
          }
        }
        if (end === -1) {
          if (!this.atEnd)
            return this.setNext("quoted-scalar");
          end = this.buffer.length;
        }
        yield* this.pushToIndex(end + 1, false);
        return this.flowLevel ? "flow" : "doc";
      }
      *parseBlockScalarHeader() {
        this.blockScalarIndent = -1;
        this.blockScalarKeep = false;
        let i = this.pos;
        while (true) {
          const ch = this.buffer[++i];
          if (ch === "+")
            this.blockScalarKeep = true;
          else if (ch > "0" && ch <= "9")
            this.blockScalarIndent = Number(ch) - 1;
          else if (ch !== "-")
            break;
        }
        return yield* this.pushUntil((ch) => isEmpty(ch) || ch === "#");
      }
      *parseBlockScalar() {
        let nl = this.pos - 1;
        let indent = 0;
        let ch;
        loop: for (let i2 = this.pos; ch = this.buffer[i2]; ++i2) {
          switch (ch) {
            case " ":
              indent += 1;
              break;
            case "\n":
              nl = i2;
              indent = 0;
              break;
            case "\r": {
              const next = this.buffer[i2 + 1];
              if (!next && !this.atEnd)
                return this.setNext("block-scalar");
              if (next === "\n")
                break;
            }
            // fallthrough
            default:
              break loop;
          }
        }
        if (!ch && !this.atEnd)
          return this.setNext("block-scalar");
        if (indent >= this.indentNext) {
          if (this.blockScalarIndent === -1)
            this.indentNext = indent;
          else {
            this.indentNext = this.blockScalarIndent + (this.indentNext === 0 ? 1 : this.indentNext);
          }
          do {
            const cs = this.continueScalar(nl + 1);
            if (cs === -1)
              break;
            nl = this.buffer.indexOf("\n", cs);
          } while (nl !== -1);
          if (nl === -1) {
            if (!this.atEnd)
              return this.setNext("block-scalar");
            nl = this.buffer.length;
          }
        }
        let i = nl + 1;
        ch = this.buffer[i];
        while (ch === " ")
          ch = this.buffer[++i];
        if (ch === "	") {
          while (ch === "	" || ch === " " || ch === "\r" || ch === "\n")
            ch = this.buffer[++i];
          nl = i - 1;
        } else if (!this.blockScalarKeep) {
          do {
            let i2 = nl - 1;
            let ch2 = this.buffer[i2];
            if (ch2 === "\r")
              ch2 = this.buffer[--i2];
            const lastChar = i2;
            while (ch2 === " ")
              ch2 = this.buffer[--i2];
            if (ch2 === "\n" && i2 >= this.pos && i2 + 1 + indent > lastChar)
              nl = i2;
            else
              break;
          } while (true);
        }
        yield cst.SCALAR;
        yield* this.pushToIndex(nl + 1, true);
        return yield* this.parseLineStart();
      }
      *parsePlainScalar() {
        const inFlow = this.flowLevel > 0;
        let end = this.pos - 1;
        let i = this.pos - 1;
        let ch;
        while (ch = this.buffer[++i]) {
          if (ch === ":") {
            const next = this.buffer[i + 1];
            if (isEmpty(next) || inFlow && flowIndicatorChars.has(next))
              break;
            end = i;
          } else if (isEmpty(ch)) {
            let next = this.buffer[i + 1];
            if (ch === "\r") {
              if (next === "\n") {
                i += 1;
                ch = "\n";
                next = this.buffer[i + 1];
              } else
                end = i;
            }
            if (next === "#" || inFlow && flowIndicatorChars.has(next))
              break;
            if (ch === "\n") {
              const cs = this.continueScalar(i + 1);
              if (cs === -1)
                break;
              i = Math.max(i, cs - 2);
            }
          } else {
            if (inFlow && flowIndicatorChars.has(ch))
              break;
            end = i;
          }
        }
        if (!ch && !this.atEnd)
          return this.setNext("plain-scalar");
        yield cst.SCALAR;
        yield* this.pushToIndex(end + 1, true);
        return inFlow ? "flow" : "doc";
      }
      *pushCount(n) {
        if (n > 0) {
          yield this.buffer.substr(this.pos, n);
          this.pos += n;
          return n;
        }
        return 0;
      }
      *pushToIndex(i, allowEmpty) {
        const s = this.buffer.slice(this.pos, i);
        if (s) {
          yield s;
          this.pos += s.length;
          return s.length;
        } else if (allowEmpty)
          yield "";
        return 0;
      }
      *pushIndicators() {
        let n = 0;
        loop: while (true) {
          switch (this.charAt(0)) {
            case "!":
              n += yield* this.pushTag();
              n += yield* this.pushSpaces(true);
              continue loop;
            case "&":
              n += yield* this.pushUntil(isNotAnchorChar);
              n += yield* this.pushSpaces(true);
              continue loop;
            case "-":
            // this is an error
            case "?":
            // this is an error outside flow collections
            case ":": {
              const inFlow = this.flowLevel > 0;
              const ch1 = this.charAt(1);
              if (isEmpty(ch1) || inFlow && flowIndicatorChars.has(ch1)) {
                if (!inFlow)
                  this.indentNext = this.indentValue + 1;
                else if (this.flowKey)
                  this.flowKey = false;
                n += yield* this.pushCount(1);
                n += yield* this.pushSpaces(true);
                continue loop;
              }
            }
          }
          break loop;
        }
        return n;
      }
      *pushTag() {
        if (this.charAt(1) === "<") {
          let i = this.pos + 2;
          let ch = this.buffer[i];
          while (!isEmpty(ch) && ch !== ">")
            ch = this.buffer[++i];
          return yield* this.pushToIndex(ch === ">" ? i + 1 : i, false);
        } else {
          let i = this.pos + 1;
          let ch = this.buffer[i];
          while (ch) {
            if (tagChars.has(ch))
              ch = this.buffer[++i];
            else if (ch === "%" && hexDigits.has(this.buffer[i + 1]) && hexDigits.has(this.buffer[i + 2])) {
              ch = this.buffer[i += 3];
            } else
              break;
          }
          return yield* this.pushToIndex(i, false);
        }
      }
      *pushNewline() {
        const ch = this.buffer[this.pos];
        if (ch === "\n")
          return yield* this.pushCount(1);
        else if (ch === "\r" && this.charAt(1) === "\n")
          return yield* this.pushCount(2);
        else
          return 0;
      }
      *pushSpaces(allowTabs) {
        let i = this.pos - 1;
        let ch;
        do {
          ch = this.buffer[++i];
        } while (ch === " " || allowTabs && ch === "	");
        const n = i - this.pos;
        if (n > 0) {
          yield this.buffer.substr(this.pos, n);
          this.pos = i;
        }
        return n;
      }
      *pushUntil(test) {
        let i = this.pos;
        let ch = this.buffer[i];
        while (!test(ch))
          ch = this.buffer[++i];
        return yield* this.pushToIndex(i, false);
      }
    };
    exports.Lexer = Lexer;
  }
});

// node_modules/yaml/dist/parse/line-counter.js
var require_line_counter = __commonJS({
  "node_modules/yaml/dist/parse/line-counter.js"(exports) {
    "use strict";
    var LineCounter3 = class {
      constructor() {
        this.lineStarts = [];
        this.addNewLine = (offset) => this.lineStarts.push(offset);
        this.linePos = (offset) => {
          let low = 0;
          let high = this.lineStarts.length;
          while (low < high) {
            const mid = low + high >> 1;
            if (this.lineStarts[mid] < offset)
              low = mid + 1;
            else
              high = mid;
          }
          if (this.lineStarts[low] === offset)
            return { line: low + 1, col: 1 };
          if (low === 0)
            return { line: 0, col: offset };
          const start = this.lineStarts[low - 1];
          return { line: low, col: offset - start + 1 };
        };
      }
    };
    exports.LineCounter = LineCounter3;
  }
});

// node_modules/yaml/dist/parse/parser.js
var require_parser = __commonJS({
  "node_modules/yaml/dist/parse/parser.js"(exports) {
    "use strict";
    var node_process = __require("process");
    var cst = require_cst();
    var lexer = require_lexer();
    function includesToken(list2, type) {
      for (let i = 0; i < list2.length; ++i)
        if (list2[i].type === type)
          return true;
      return false;
    }
    function findNonEmptyIndex(list2) {
      for (let i = 0; i < list2.length; ++i) {
        switch (list2[i].type) {
          case "space":
          case "comment":
          case "newline":
            break;
          default:
            return i;
        }
      }
      return -1;
    }
    function isFlowToken(token) {
      switch (token?.type) {
        case "alias":
        case "scalar":
        case "single-quoted-scalar":
        case "double-quoted-scalar":
        case "flow-collection":
          return true;
        default:
          return false;
      }
    }
    function getPrevProps(parent) {
      switch (parent.type) {
        case "document":
          return parent.start;
        case "block-map": {
          const it = parent.items[parent.items.length - 1];
          return it.sep ?? it.start;
        }
        case "block-seq":
          return parent.items[parent.items.length - 1].start;
        /* istanbul ignore next should not happen */
        default:
          return [];
      }
    }
    function getFirstKeyStartProps(prev) {
      if (prev.length === 0)
        return [];
      let i = prev.length;
      loop: while (--i >= 0) {
        switch (prev[i].type) {
          case "doc-start":
          case "explicit-key-ind":
          case "map-value-ind":
          case "seq-item-ind":
          case "newline":
            break loop;
        }
      }
      while (prev[++i]?.type === "space") {
      }
      return prev.splice(i, prev.length);
    }
    function arrayPushArray(target, source) {
      if (source.length < 1e5)
        Array.prototype.push.apply(target, source);
      else
        for (let i = 0; i < source.length; ++i)
          target.push(source[i]);
    }
    function fixFlowSeqItems(fc) {
      if (fc.start.type === "flow-seq-start") {
        for (const it of fc.items) {
          if (it.sep && !it.value && !includesToken(it.start, "explicit-key-ind") && !includesToken(it.sep, "map-value-ind")) {
            if (it.key)
              it.value = it.key;
            delete it.key;
            if (isFlowToken(it.value)) {
              if (it.value.end)
                arrayPushArray(it.value.end, it.sep);
              else
                it.value.end = it.sep;
            } else
              arrayPushArray(it.start, it.sep);
            delete it.sep;
          }
        }
      }
    }
    var Parser2 = class {
      /**
       * @param onNewLine - If defined, called separately with the start position of
       *   each new line (in `parse()`, including the start of input).
       */
      constructor(onNewLine) {
        this.atNewLine = true;
        this.atScalar = false;
        this.indent = 0;
        this.offset = 0;
        this.onKeyLine = false;
        this.stack = [];
        this.source = "";
        this.type = "";
        this.lexer = new lexer.Lexer();
        this.onNewLine = onNewLine;
      }
      /**
       * Parse `source` as a YAML stream.
       * If `incomplete`, a part of the last line may be left as a buffer for the next call.
       *
       * Errors are not thrown, but yielded as `{ type: 'error', message }` tokens.
       *
       * @returns A generator of tokens representing each directive, document, and other structure.
       */
      *parse(source, incomplete = false) {
        if (this.onNewLine && this.offset === 0)
          this.onNewLine(0);
        for (const lexeme of this.lexer.lex(source, incomplete))
          yield* this.next(lexeme);
        if (!incomplete)
          yield* this.end();
      }
      /**
       * Advance the parser by the `source` of one lexical token.
       */
      *next(source) {
        this.source = source;
        if (node_process.env.LOG_TOKENS)
          console.log("|", cst.prettyToken(source));
        if (this.atScalar) {
          this.atScalar = false;
          yield* this.step();
          this.offset += source.length;
          return;
        }
        const type = cst.tokenType(source);
        if (!type) {
          const message = `Not a YAML token: ${source}`;
          yield* this.pop({ type: "error", offset: this.offset, message, source });
          this.offset += source.length;
        } else if (type === "scalar") {
          this.atNewLine = false;
          this.atScalar = true;
          this.type = "scalar";
        } else {
          this.type = type;
          yield* this.step();
          switch (type) {
            case "newline":
              this.atNewLine = true;
              this.indent = 0;
              if (this.onNewLine)
                this.onNewLine(this.offset + source.length);
              break;
            case "space":
              if (this.atNewLine && source[0] === " ")
                this.indent += source.length;
              break;
            case "explicit-key-ind":
            case "map-value-ind":
            case "seq-item-ind":
              if (this.atNewLine)
                this.indent += source.length;
              break;
            case "doc-mode":
            case "flow-error-end":
              return;
            default:
              this.atNewLine = false;
          }
          this.offset += source.length;
        }
      }
      /** Call at end of input to push out any remaining constructions */
      *end() {
        while (this.stack.length > 0)
          yield* this.pop();
      }
      get sourceToken() {
        const st = {
          type: this.type,
          offset: this.offset,
          indent: this.indent,
          source: this.source
        };
        return st;
      }
      *step() {
        const top = this.peek(1);
        if (this.type === "doc-end" && top?.type !== "doc-end") {
          while (this.stack.length > 0)
            yield* this.pop();
          this.stack.push({
            type: "doc-end",
            offset: this.offset,
            source: this.source
          });
          return;
        }
        if (!top)
          return yield* this.stream();
        switch (top.type) {
          case "document":
            return yield* this.document(top);
          case "alias":
          case "scalar":
          case "single-quoted-scalar":
          case "double-quoted-scalar":
            return yield* this.scalar(top);
          case "block-scalar":
            return yield* this.blockScalar(top);
          case "block-map":
            return yield* this.blockMap(top);
          case "block-seq":
            return yield* this.blockSequence(top);
          case "flow-collection":
            return yield* this.flowCollection(top);
          case "doc-end":
            return yield* this.documentEnd(top);
        }
        yield* this.pop();
      }
      peek(n) {
        return this.stack[this.stack.length - n];
      }
      *pop(error) {
        const token = error ?? this.stack.pop();
        if (!token) {
          const message = "Tried to pop an empty stack";
          yield { type: "error", offset: this.offset, source: "", message };
        } else if (this.stack.length === 0) {
          yield token;
        } else {
          const top = this.peek(1);
          if (token.type === "block-scalar") {
            token.indent = "indent" in top ? top.indent : 0;
          } else if (token.type === "flow-collection" && top.type === "document") {
            token.indent = 0;
          }
          if (token.type === "flow-collection")
            fixFlowSeqItems(token);
          switch (top.type) {
            case "document":
              top.value = token;
              break;
            case "block-scalar":
              top.props.push(token);
              break;
            case "block-map": {
              const it = top.items[top.items.length - 1];
              if (it.value) {
                top.items.push({ start: [], key: token, sep: [] });
                this.onKeyLine = true;
                return;
              } else if (it.sep) {
                it.value = token;
              } else {
                Object.assign(it, { key: token, sep: [] });
                this.onKeyLine = !it.explicitKey;
                return;
              }
              break;
            }
            case "block-seq": {
              const it = top.items[top.items.length - 1];
              if (it.value)
                top.items.push({ start: [], value: token });
              else
                it.value = token;
              break;
            }
            case "flow-collection": {
              const it = top.items[top.items.length - 1];
              if (!it || it.value)
                top.items.push({ start: [], key: token, sep: [] });
              else if (it.sep)
                it.value = token;
              else
                Object.assign(it, { key: token, sep: [] });
              return;
            }
            /* istanbul ignore next should not happen */
            default:
              yield* this.pop();
              yield* this.pop(token);
          }
          if ((top.type === "document" || top.type === "block-map" || top.type === "block-seq") && (token.type === "block-map" || token.type === "block-seq")) {
            const last = token.items[token.items.length - 1];
            if (last && !last.sep && !last.value && last.start.length > 0 && findNonEmptyIndex(last.start) === -1 && (token.indent === 0 || last.start.every((st) => st.type !== "comment" || st.indent < token.indent))) {
              if (top.type === "document")
                top.end = last.start;
              else
                top.items.push({ start: last.start });
              token.items.splice(-1, 1);
            }
          }
        }
      }
      *stream() {
        switch (this.type) {
          case "directive-line":
            yield { type: "directive", offset: this.offset, source: this.source };
            return;
          case "byte-order-mark":
          case "space":
          case "comment":
          case "newline":
            yield this.sourceToken;
            return;
          case "doc-mode":
          case "doc-start": {
            const doc = {
              type: "document",
              offset: this.offset,
              start: []
            };
            if (this.type === "doc-start")
              doc.start.push(this.sourceToken);
            this.stack.push(doc);
            return;
          }
        }
        yield {
          type: "error",
          offset: this.offset,
          message: `Unexpected ${this.type} token in YAML stream`,
          source: this.source
        };
      }
      *document(doc) {
        if (doc.value)
          return yield* this.lineEnd(doc);
        switch (this.type) {
          case "doc-start": {
            if (findNonEmptyIndex(doc.start) !== -1) {
              yield* this.pop();
              yield* this.step();
            } else
              doc.start.push(this.sourceToken);
            return;
          }
          case "anchor":
          case "tag":
          case "space":
          case "comment":
          case "newline":
            doc.start.push(this.sourceToken);
            return;
        }
        const bv = this.startBlockValue(doc);
        if (bv)
          this.stack.push(bv);
        else {
          yield {
            type: "error",
            offset: this.offset,
            message: `Unexpected ${this.type} token in YAML document`,
            source: this.source
          };
        }
      }
      *scalar(scalar) {
        if (this.type === "map-value-ind") {
          const prev = getPrevProps(this.peek(2));
          const start = getFirstKeyStartProps(prev);
          let sep3;
          if (scalar.end) {
            sep3 = scalar.end;
            sep3.push(this.sourceToken);
            delete scalar.end;
          } else
            sep3 = [this.sourceToken];
          const map = {
            type: "block-map",
            offset: scalar.offset,
            indent: scalar.indent,
            items: [{ start, key: scalar, sep: sep3 }]
          };
          this.onKeyLine = true;
          this.stack[this.stack.length - 1] = map;
        } else
          yield* this.lineEnd(scalar);
      }
      *blockScalar(scalar) {
        switch (this.type) {
          case "space":
          case "comment":
          case "newline":
            scalar.props.push(this.sourceToken);
            return;
          case "scalar":
            scalar.source = this.source;
            this.atNewLine = true;
            this.indent = 0;
            if (this.onNewLine) {
              let nl = this.source.indexOf("\n") + 1;
              while (nl !== 0) {
                this.onNewLine(this.offset + nl);
                nl = this.source.indexOf("\n", nl) + 1;
              }
            }
            yield* this.pop();
            break;
          /* istanbul ignore next should not happen */
          default:
            yield* this.pop();
            yield* this.step();
        }
      }
      *blockMap(map) {
        const it = map.items[map.items.length - 1];
        switch (this.type) {
          case "newline":
            this.onKeyLine = false;
            if (it.value) {
              const end = "end" in it.value ? it.value.end : void 0;
              const last = Array.isArray(end) ? end[end.length - 1] : void 0;
              if (last?.type === "comment")
                end?.push(this.sourceToken);
              else
                map.items.push({ start: [this.sourceToken] });
            } else if (it.sep) {
              it.sep.push(this.sourceToken);
            } else {
              it.start.push(this.sourceToken);
            }
            return;
          case "space":
          case "comment":
            if (it.value) {
              map.items.push({ start: [this.sourceToken] });
            } else if (it.sep) {
              it.sep.push(this.sourceToken);
            } else {
              if (this.atIndentedComment(it.start, map.indent)) {
                const prev = map.items[map.items.length - 2];
                const end = prev?.value?.end;
                if (Array.isArray(end)) {
                  arrayPushArray(end, it.start);
                  end.push(this.sourceToken);
                  map.items.pop();
                  return;
                }
              }
              it.start.push(this.sourceToken);
            }
            return;
        }
        if (this.indent >= map.indent) {
          const atMapIndent = !this.onKeyLine && this.indent === map.indent;
          const atNextItem = atMapIndent && (it.sep || it.explicitKey) && this.type !== "seq-item-ind";
          let start = [];
          if (atNextItem && it.sep && !it.value) {
            const nl = [];
            for (let i = 0; i < it.sep.length; ++i) {
              const st = it.sep[i];
              switch (st.type) {
                case "newline":
                  nl.push(i);
                  break;
                case "space":
                  break;
                case "comment":
                  if (st.indent > map.indent)
                    nl.length = 0;
                  break;
                default:
                  nl.length = 0;
              }
            }
            if (nl.length >= 2)
              start = it.sep.splice(nl[1]);
          }
          switch (this.type) {
            case "anchor":
            case "tag":
              if (atNextItem || it.value) {
                start.push(this.sourceToken);
                map.items.push({ start });
                this.onKeyLine = true;
              } else if (it.sep) {
                it.sep.push(this.sourceToken);
              } else {
                it.start.push(this.sourceToken);
              }
              return;
            case "explicit-key-ind":
              if (!it.sep && !it.explicitKey) {
                it.start.push(this.sourceToken);
                it.explicitKey = true;
              } else if (atNextItem || it.value) {
                start.push(this.sourceToken);
                map.items.push({ start, explicitKey: true });
              } else {
                this.stack.push({
                  type: "block-map",
                  offset: this.offset,
                  indent: this.indent,
                  items: [{ start: [this.sourceToken], explicitKey: true }]
                });
              }
              this.onKeyLine = true;
              return;
            case "map-value-ind":
              if (it.explicitKey) {
                if (!it.sep) {
                  if (includesToken(it.start, "newline")) {
                    Object.assign(it, { key: null, sep: [this.sourceToken] });
                  } else {
                    const start2 = getFirstKeyStartProps(it.start);
                    this.stack.push({
                      type: "block-map",
                      offset: this.offset,
                      indent: this.indent,
                      items: [{ start: start2, key: null, sep: [this.sourceToken] }]
                    });
                  }
                } else if (it.value) {
                  map.items.push({ start: [], key: null, sep: [this.sourceToken] });
                } else if (includesToken(it.sep, "map-value-ind")) {
                  this.stack.push({
                    type: "block-map",
                    offset: this.offset,
                    indent: this.indent,
                    items: [{ start, key: null, sep: [this.sourceToken] }]
                  });
                } else if (isFlowToken(it.key) && !includesToken(it.sep, "newline")) {
                  const start2 = getFirstKeyStartProps(it.start);
                  const key = it.key;
                  const sep3 = it.sep;
                  sep3.push(this.sourceToken);
                  delete it.key;
                  delete it.sep;
                  this.stack.push({
                    type: "block-map",
                    offset: this.offset,
                    indent: this.indent,
                    items: [{ start: start2, key, sep: sep3 }]
                  });
                } else if (start.length > 0) {
                  it.sep = it.sep.concat(start, this.sourceToken);
                } else {
                  it.sep.push(this.sourceToken);
                }
              } else {
                if (!it.sep) {
                  Object.assign(it, { key: null, sep: [this.sourceToken] });
                } else if (it.value || atNextItem) {
                  map.items.push({ start, key: null, sep: [this.sourceToken] });
                } else if (includesToken(it.sep, "map-value-ind")) {
                  this.stack.push({
                    type: "block-map",
                    offset: this.offset,
                    indent: this.indent,
                    items: [{ start: [], key: null, sep: [this.sourceToken] }]
                  });
                } else {
                  it.sep.push(this.sourceToken);
                }
              }
              this.onKeyLine = true;
              return;
            case "alias":
            case "scalar":
            case "single-quoted-scalar":
            case "double-quoted-scalar": {
              const fs = this.flowScalar(this.type);
              if (atNextItem || it.value) {
                map.items.push({ start, key: fs, sep: [] });
                this.onKeyLine = true;
              } else if (it.sep) {
                this.stack.push(fs);
              } else {
                Object.assign(it, { key: fs, sep: [] });
                this.onKeyLine = true;
              }
              return;
            }
            default: {
              const bv = this.startBlockValue(map);
              if (bv) {
                if (bv.type === "block-seq") {
                  if (!it.explicitKey && it.sep && !includesToken(it.sep, "newline")) {
                    yield* this.pop({
                      type: "error",
                      offset: this.offset,
                      message: "Unexpected block-seq-ind on same line with key",
                      source: this.source
                    });
                    return;
                  }
                } else if (atMapIndent) {
                  map.items.push({ start });
                }
                this.stack.push(bv);
                return;
              }
            }
          }
        }
        yield* this.pop();
        yield* this.step();
      }
      *blockSequence(seq) {
        const it = seq.items[seq.items.length - 1];
        switch (this.type) {
          case "newline":
            if (it.value) {
              const end = "end" in it.value ? it.value.end : void 0;
              const last = Array.isArray(end) ? end[end.length - 1] : void 0;
              if (last?.type === "comment")
                end?.push(this.sourceToken);
              else
                seq.items.push({ start: [this.sourceToken] });
            } else
              it.start.push(this.sourceToken);
            return;
          case "space":
          case "comment":
            if (it.value)
              seq.items.push({ start: [this.sourceToken] });
            else {
              if (this.atIndentedComment(it.start, seq.indent)) {
                const prev = seq.items[seq.items.length - 2];
                const end = prev?.value?.end;
                if (Array.isArray(end)) {
                  arrayPushArray(end, it.start);
                  end.push(this.sourceToken);
                  seq.items.pop();
                  return;
                }
              }
              it.start.push(this.sourceToken);
            }
            return;
          case "anchor":
          case "tag":
            if (it.value || this.indent <= seq.indent)
              break;
            it.start.push(this.sourceToken);
            return;
          case "seq-item-ind":
            if (this.indent !== seq.indent)
              break;
            if (it.value || includesToken(it.start, "seq-item-ind"))
              seq.items.push({ start: [this.sourceToken] });
            else
              it.start.push(this.sourceToken);
            return;
        }
        if (this.indent > seq.indent) {
          const bv = this.startBlockValue(seq);
          if (bv) {
            this.stack.push(bv);
            return;
          }
        }
        yield* this.pop();
        yield* this.step();
      }
      *flowCollection(fc) {
        const it = fc.items[fc.items.length - 1];
        if (this.type === "flow-error-end") {
          let top;
          do {
            yield* this.pop();
            top = this.peek(1);
          } while (top?.type === "flow-collection");
        } else if (fc.end.length === 0) {
          switch (this.type) {
            case "comma":
            case "explicit-key-ind":
              if (!it || it.sep)
                fc.items.push({ start: [this.sourceToken] });
              else
                it.start.push(this.sourceToken);
              return;
            case "map-value-ind":
              if (!it || it.value)
                fc.items.push({ start: [], key: null, sep: [this.sourceToken] });
              else if (it.sep)
                it.sep.push(this.sourceToken);
              else
                Object.assign(it, { key: null, sep: [this.sourceToken] });
              return;
            case "space":
            case "comment":
            case "newline":
            case "anchor":
            case "tag":
              if (!it || it.value)
                fc.items.push({ start: [this.sourceToken] });
              else if (it.sep)
                it.sep.push(this.sourceToken);
              else
                it.start.push(this.sourceToken);
              return;
            case "alias":
            case "scalar":
            case "single-quoted-scalar":
            case "double-quoted-scalar": {
              const fs = this.flowScalar(this.type);
              if (!it || it.value)
                fc.items.push({ start: [], key: fs, sep: [] });
              else if (it.sep)
                this.stack.push(fs);
              else
                Object.assign(it, { key: fs, sep: [] });
              return;
            }
            case "flow-map-end":
            case "flow-seq-end":
              fc.end.push(this.sourceToken);
              return;
          }
          const bv = this.startBlockValue(fc);
          if (bv)
            this.stack.push(bv);
          else {
            yield* this.pop();
            yield* this.step();
          }
        } else {
          const parent = this.peek(2);
          if (parent.type === "block-map" && (this.type === "map-value-ind" && parent.indent === fc.indent || this.type === "newline" && !parent.items[parent.items.length - 1].sep)) {
            yield* this.pop();
            yield* this.step();
          } else if (this.type === "map-value-ind" && parent.type !== "flow-collection") {
            const prev = getPrevProps(parent);
            const start = getFirstKeyStartProps(prev);
            fixFlowSeqItems(fc);
            const sep3 = fc.end.splice(1, fc.end.length);
            sep3.push(this.sourceToken);
            const map = {
              type: "block-map",
              offset: fc.offset,
              indent: fc.indent,
              items: [{ start, key: fc, sep: sep3 }]
            };
            this.onKeyLine = true;
            this.stack[this.stack.length - 1] = map;
          } else {
            yield* this.lineEnd(fc);
          }
        }
      }
      flowScalar(type) {
        if (this.onNewLine) {
          let nl = this.source.indexOf("\n") + 1;
          while (nl !== 0) {
            this.onNewLine(this.offset + nl);
            nl = this.source.indexOf("\n", nl) + 1;
          }
        }
        return {
          type,
          offset: this.offset,
          indent: this.indent,
          source: this.source
        };
      }
      startBlockValue(parent) {
        switch (this.type) {
          case "alias":
          case "scalar":
          case "single-quoted-scalar":
          case "double-quoted-scalar":
            return this.flowScalar(this.type);
          case "block-scalar-header":
            return {
              type: "block-scalar",
              offset: this.offset,
              indent: this.indent,
              props: [this.sourceToken],
              source: ""
            };
          case "flow-map-start":
          case "flow-seq-start":
            return {
              type: "flow-collection",
              offset: this.offset,
              indent: this.indent,
              start: this.sourceToken,
              items: [],
              end: []
            };
          case "seq-item-ind":
            return {
              type: "block-seq",
              offset: this.offset,
              indent: this.indent,
              items: [{ start: [this.sourceToken] }]
            };
          case "explicit-key-ind": {
            this.onKeyLine = true;
            const prev = getPrevProps(parent);
            const start = getFirstKeyStartProps(prev);
            start.push(this.sourceToken);
            return {
              type: "block-map",
              offset: this.offset,
              indent: this.indent,
              items: [{ start, explicitKey: true }]
            };
          }
          case "map-value-ind": {
            this.onKeyLine = true;
            const prev = getPrevProps(parent);
            const start = getFirstKeyStartProps(prev);
            return {
              type: "block-map",
              offset: this.offset,
              indent: this.indent,
              items: [{ start, key: null, sep: [this.sourceToken] }]
            };
          }
        }
        return null;
      }
      atIndentedComment(start, indent) {
        if (this.type !== "comment")
          return false;
        if (this.indent <= indent)
          return false;
        return start.every((st) => st.type === "newline" || st.type === "space");
      }
      *documentEnd(docEnd) {
        if (this.type !== "doc-mode") {
          if (docEnd.end)
            docEnd.end.push(this.sourceToken);
          else
            docEnd.end = [this.sourceToken];
          if (this.type === "newline")
            yield* this.pop();
        }
      }
      *lineEnd(token) {
        switch (this.type) {
          case "comma":
          case "doc-start":
          case "doc-end":
          case "flow-seq-end":
          case "flow-map-end":
          case "map-value-ind":
            yield* this.pop();
            yield* this.step();
            break;
          case "newline":
            this.onKeyLine = false;
          // fallthrough
          case "space":
          case "comment":
          default:
            if (token.end)
              token.end.push(this.sourceToken);
            else
              token.end = [this.sourceToken];
            if (this.type === "newline")
              yield* this.pop();
        }
      }
    };
    exports.Parser = Parser2;
  }
});

// node_modules/yaml/dist/public-api.js
var require_public_api = __commonJS({
  "node_modules/yaml/dist/public-api.js"(exports) {
    "use strict";
    var composer = require_composer();
    var Document = require_Document();
    var errors = require_errors();
    var log = require_log();
    var identity = require_identity();
    var lineCounter = require_line_counter();
    var parser = require_parser();
    function parseOptions(options) {
      const prettyErrors = options.prettyErrors !== false;
      const lineCounter$1 = options.lineCounter || prettyErrors && new lineCounter.LineCounter() || null;
      return { lineCounter: lineCounter$1, prettyErrors };
    }
    function parseAllDocuments(source, options = {}) {
      const { lineCounter: lineCounter2, prettyErrors } = parseOptions(options);
      const parser$1 = new parser.Parser(lineCounter2?.addNewLine);
      const composer$1 = new composer.Composer(options);
      const docs = Array.from(composer$1.compose(parser$1.parse(source)));
      if (prettyErrors && lineCounter2)
        for (const doc of docs) {
          doc.errors.forEach(errors.prettifyError(source, lineCounter2));
          doc.warnings.forEach(errors.prettifyError(source, lineCounter2));
        }
      if (docs.length > 0)
        return docs;
      return Object.assign([], { empty: true }, composer$1.streamInfo());
    }
    function parseDocument3(source, options = {}) {
      const { lineCounter: lineCounter2, prettyErrors } = parseOptions(options);
      const parser$1 = new parser.Parser(lineCounter2?.addNewLine);
      const composer$1 = new composer.Composer(options);
      let doc = null;
      for (const _doc of composer$1.compose(parser$1.parse(source), true, source.length)) {
        if (!doc)
          doc = _doc;
        else if (doc.options.logLevel !== "silent") {
          doc.errors.push(new errors.YAMLParseError(_doc.range.slice(0, 2), "MULTIPLE_DOCS", "Source contains multiple documents; please use YAML.parseAllDocuments()"));
          break;
        }
      }
      if (prettyErrors && lineCounter2) {
        doc.errors.forEach(errors.prettifyError(source, lineCounter2));
        doc.warnings.forEach(errors.prettifyError(source, lineCounter2));
      }
      return doc;
    }
    function parse(src, reviver, options) {
      let _reviver = void 0;
      if (typeof reviver === "function") {
        _reviver = reviver;
      } else if (options === void 0 && reviver && typeof reviver === "object") {
        options = reviver;
      }
      const doc = parseDocument3(src, options);
      if (!doc)
        return null;
      doc.warnings.forEach((warning) => log.warn(doc.options.logLevel, warning));
      if (doc.errors.length > 0) {
        if (doc.options.logLevel !== "silent")
          throw doc.errors[0];
        else
          doc.errors = [];
      }
      return doc.toJS(Object.assign({ reviver: _reviver }, options));
    }
    function stringify(value, replacer, options) {
      let _replacer = null;
      if (typeof replacer === "function" || Array.isArray(replacer)) {
        _replacer = replacer;
      } else if (options === void 0 && replacer) {
        options = replacer;
      }
      if (typeof options === "string")
        options = options.length;
      if (typeof options === "number") {
        const indent = Math.round(options);
        options = indent < 1 ? void 0 : indent > 8 ? { indent: 8 } : { indent };
      }
      if (value === void 0) {
        const { keepUndefined } = options ?? replacer ?? {};
        if (!keepUndefined)
          return void 0;
      }
      if (identity.isDocument(value) && !_replacer)
        return value.toString(options);
      return new Document.Document(value, _replacer, options).toString(options);
    }
    exports.parse = parse;
    exports.parseAllDocuments = parseAllDocuments;
    exports.parseDocument = parseDocument3;
    exports.stringify = stringify;
  }
});

// node_modules/yaml/dist/index.js
var require_dist = __commonJS({
  "node_modules/yaml/dist/index.js"(exports) {
    "use strict";
    var composer = require_composer();
    var Document = require_Document();
    var Schema = require_Schema();
    var errors = require_errors();
    var Alias = require_Alias();
    var identity = require_identity();
    var Pair = require_Pair();
    var Scalar = require_Scalar();
    var YAMLMap = require_YAMLMap();
    var YAMLSeq = require_YAMLSeq();
    var cst = require_cst();
    var lexer = require_lexer();
    var lineCounter = require_line_counter();
    var parser = require_parser();
    var publicApi = require_public_api();
    var visit3 = require_visit();
    exports.Composer = composer.Composer;
    exports.Document = Document.Document;
    exports.Schema = Schema.Schema;
    exports.YAMLError = errors.YAMLError;
    exports.YAMLParseError = errors.YAMLParseError;
    exports.YAMLWarning = errors.YAMLWarning;
    exports.Alias = Alias.Alias;
    exports.isAlias = identity.isAlias;
    exports.isCollection = identity.isCollection;
    exports.isDocument = identity.isDocument;
    exports.isMap = identity.isMap;
    exports.isNode = identity.isNode;
    exports.isPair = identity.isPair;
    exports.isScalar = identity.isScalar;
    exports.isSeq = identity.isSeq;
    exports.Pair = Pair.Pair;
    exports.Scalar = Scalar.Scalar;
    exports.YAMLMap = YAMLMap.YAMLMap;
    exports.YAMLSeq = YAMLSeq.YAMLSeq;
    exports.CST = cst;
    exports.Lexer = lexer.Lexer;
    exports.LineCounter = lineCounter.LineCounter;
    exports.Parser = parser.Parser;
    exports.parse = publicApi.parse;
    exports.parseAllDocuments = publicApi.parseAllDocuments;
    exports.parseDocument = publicApi.parseDocument;
    exports.stringify = publicApi.stringify;
    exports.visit = visit3.visit;
    exports.visitAsync = visit3.visitAsync;
  }
});

// src/check/base-worker.ts
import { workerData } from "node:worker_threads";

// src/config/model.ts
var INPUT = -1;
function positionCount(shape) {
  return shape.reduce((a, b) => a * b, 1);
}
function layerLabel(layer) {
  return layer.name ?? layer.index;
}
function layerWidth(layer) {
  switch (layer.kind) {
    case "conv":
    case "conv-transpose":
      return layer.channels;
    case "dense":
      return layer.units;
    case "recurrent":
      return layer.hidden;
    case "embedding":
      return layer.dim;
    default:
      return void 0;
  }
}
var WEIGHTED_KINDS = /* @__PURE__ */ new Set(["conv", "conv-transpose", "dense", "recurrent", "embedding", "attention"]);
var PASS_THROUGH = /* @__PURE__ */ new Set(["pointwise", "pool", "upsample", "flatten", "position", "class-token"]);
function firstMaps(model) {
  const reached = /* @__PURE__ */ new Set([INPUT]);
  const maps = [];
  for (const layer of model.layers) {
    if (layer.kind === "merge" || !layer.inputs.some((i) => reached.has(i))) continue;
    if (PASS_THROUGH.has(layer.kind)) reached.add(layer.index);
    else if (layerWidth(layer) !== void 0) maps.push(layer);
  }
  return maps;
}
function representationOf(model) {
  if (model.input.vocabulary !== void 0) return model.input.vocabulary;
  if (model.input.representation !== void 0) return model.input.representation;
  let best;
  for (const layer of firstMaps(model)) {
    const w = layerWidth(layer);
    if (best === void 0 || w > best) best = w;
  }
  return best;
}

// src/config/limits.ts
var MAX_EXPANDED_LAYERS = 1e4;
var MAX_ALIAS_EXPANSIONS = 100;
var MAX_DOCUMENT_BYTES = 4 * 1024 * 1024;
var MAX_NESTING_DEPTH = 100;
var MAX_INPUT_POSITIONS = 4e6;
var MAX_MODEL_INTEGER = 2 ** 31 - 1;
var MAX_DIAGNOSTICS_PER_FILE = 50;

// src/text/suggest.ts
function editDistance(a, b) {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0];
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j];
      prev[j] = Math.min(up + 1, prev[j - 1] + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = up;
    }
  }
  return prev[b.length];
}
function closest(word, candidates2) {
  let best;
  let bestD = Infinity;
  for (const c of candidates2) {
    const d = editDistance(word.toLowerCase(), c.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return bestD <= Math.max(2, Math.floor(word.length / 3)) ? best : void 0;
}

// src/partition/partition.ts
var BUILTIN_KINDS = [
  "start-end",
  "left-right",
  "top-bottom",
  "interleaved",
  "checkerboard",
  "block",
  "positions"
];
function resolvePartition(spec, shape) {
  const text = spec.trim();
  const colon = text.indexOf(":");
  const name = colon < 0 ? text : text.slice(0, colon);
  const arg = colon < 0 ? void 0 : text.slice(colon + 1);
  const n = positionCount(shape);
  if (!(n <= MAX_INPUT_POSITIONS)) return { ok: false, message: `the shape [${shape.join(", ")}] has more than ${MAX_INPUT_POSITIONS} positions` };
  const side = new Uint8Array(n);
  const is2d = shape.length === 2;
  const width = is2d ? shape[1] : n;
  const height = is2d ? shape[0] : 1;
  const shapeText = `[${shape.join(", ")}]`;
  const needs = (dims) => shape.length === dims ? void 0 : { ok: false, message: `partition '${name}' needs a ${dims}D input, but the input shape is ${shapeText}` };
  const noArg = () => arg === void 0 ? void 0 : { ok: false, message: `partition '${name}' takes no argument (got '${arg}')` };
  let description;
  switch (name) {
    case "start-end": {
      const bad = needs(1) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(n / 2);
      for (let p = 0; p < half; p++) side[p] = 1;
      description = `positions 0-${half - 1} against ${half}-${n - 1}`;
      break;
    }
    case "interleaved": {
      const bad = needs(1) ?? noArg();
      if (bad) return bad;
      for (let p = 0; p < n; p += 2) side[p] = 1;
      description = "even positions against odd positions";
      break;
    }
    case "left-right": {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(width / 2);
      for (let r = 0; r < height; r++) for (let c = 0; c < half; c++) side[r * width + c] = 1;
      description = `columns 0-${half - 1} against columns ${half}-${width - 1}`;
      break;
    }
    case "top-bottom": {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      const half = Math.floor(height / 2);
      for (let r = 0; r < half; r++) for (let c = 0; c < width; c++) side[r * width + c] = 1;
      description = `rows 0-${half - 1} against rows ${half}-${height - 1}`;
      break;
    }
    case "checkerboard": {
      const bad = needs(2) ?? noArg();
      if (bad) return bad;
      for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) if ((r + c) % 2 === 0) side[r * width + c] = 1;
      description = "positions with (row + column) even against the others";
      break;
    }
    case "block": {
      if (arg === void 0) {
        return { ok: false, message: `partition 'block' needs ranges: 'block:r0-r1,c0-c1' (2D) or 'block:a-b' (1D), half-open` };
      }
      const ranges = arg.split(",").map((part) => parseRange(part));
      if (ranges.some((r) => r === void 0) || ranges.length !== shape.length) {
        return {
          ok: false,
          message: `partition '${text}': expected ${shape.length === 2 ? "'block:r0-r1,c0-c1'" : "'block:a-b'"} with half-open integer ranges for the input shape ${shapeText}`
        };
      }
      const [rr, cr] = is2d ? [ranges[0], ranges[1]] : [[0, 1], ranges[0]];
      if (rr[1] > height || cr[1] > width || rr[0] >= rr[1] || cr[0] >= cr[1]) {
        return { ok: false, message: `partition '${text}': the ranges must be non-empty and lie inside the input shape ${shapeText}` };
      }
      for (let r = rr[0]; r < rr[1]; r++) for (let c = cr[0]; c < cr[1]; c++) side[r * width + c] = 1;
      description = is2d ? `rows ${rr[0]}-${rr[1] - 1}, columns ${cr[0]}-${cr[1] - 1} against the rest` : `positions ${cr[0]}-${cr[1] - 1} against the rest`;
      break;
    }
    case "positions": {
      if (arg === void 0 || arg.trim() === "") {
        return { ok: false, message: `partition 'positions' needs a list: 'positions:0,2,5'` };
      }
      for (const part of arg.split(",")) {
        const t = part.trim();
        if (!/^\d+$/.test(t)) return { ok: false, message: `partition '${text}': '${t}' is not a position number` };
        const p = Number(t);
        if (p >= n) return { ok: false, message: `partition '${text}': position ${p} is outside the ${n} positions of shape ${shapeText}` };
        side[p] = 1;
      }
      description = `positions ${arg.split(",").map((s) => s.trim()).join(", ")} against the rest`;
      break;
    }
    default: {
      const hint = closest(name, BUILTIN_KINDS);
      return {
        ok: false,
        message: `unknown partition '${name}'${hint ? ` (did you mean '${hint}'?)` : ""}; known: ${BUILTIN_KINDS.join(", ")}`
      };
    }
  }
  const countA = side.reduce((a, b) => a + b, 0);
  if (countA === 0 || countA === n) {
    return { ok: false, message: `partition '${text}' puts every position of shape ${shapeText} on one side` };
  }
  return { ok: true, partition: { label: text, kind: name, side, description } };
}
function parseRange(part) {
  const m = /^\s*(\d+)\s*-\s*(\d+)\s*$/.exec(part);
  if (!m) return void 0;
  return [Number(m[1]), Number(m[2])];
}

// src/network/circuit.ts
var OP_INPUT = 0;
var OP_CONST = 1;
var OP_LINEAR = 2;
var OP_PRODUCT = 3;
var OP_SUM = 4;
var CircuitBuilder = class {
  constructor(positions, limit, capacity = 1024) {
    this.positions = positions;
    this.limit = limit;
    const nodes = Math.max(1024, capacity);
    this.op = new Uint8Array(nodes);
    this.dim = new Int32Array(nodes);
    this.position = new Int32Array(nodes);
    this.tag = new Int32Array(nodes);
    this.uses = new Uint8Array(nodes);
    this.childStart = new Int32Array(nodes + 1);
    this.childList = new Int32Array(4 * nodes);
  }
  positions;
  limit;
  op;
  dim;
  position;
  tag;
  childStart;
  childList;
  uses;
  n = 0;
  m = 0;
  reuse = false;
  sums = false;
  tags = [];
  get size() {
    return this.n;
  }
  get links() {
    return this.m;
  }
  addTag(tag) {
    this.tags.push(tag);
    return this.tags.length - 1;
  }
  add(op, dim, tag, children, position = -1) {
    if (this.n >= this.limit || this.m + children.length > this.limit * 4) {
      throw new NetworkTooLarge(this.limit);
    }
    if (this.n + 1 >= this.op.length) this.growNodes();
    while (this.m + children.length > this.childList.length) this.childList = grow(this.childList, this.childList.length * 2);
    const v = this.n++;
    this.op[v] = op;
    this.dim[v] = dim;
    this.position[v] = position;
    this.tag[v] = tag;
    this.childStart[v] = this.m;
    for (const c of children) {
      this.childList[this.m++] = c;
      if (this.uses[c] > 0) this.reuse = true;
      this.uses[c] = 1;
    }
    this.childStart[v + 1] = this.m;
    if (op === OP_SUM && children.length > 1) this.sums = true;
    return v;
  }
  finish(top) {
    const bondTag = this.tag.slice(0, this.n);
    for (let v = 0; v < this.n; v++) {
      if (this.op[v] === OP_PRODUCT && this.childStart[v + 1] > this.childStart[v]) bondTag[v] = bondTag[this.childList[this.childStart[v]]];
    }
    return {
      bondTag,
      size: this.n,
      op: this.op.slice(0, this.n),
      dim: this.dim.slice(0, this.n),
      position: this.position.slice(0, this.n),
      tag: this.tag.slice(0, this.n),
      childStart: this.childStart.slice(0, this.n + 1),
      childList: this.childList.slice(0, this.m),
      top,
      tags: this.tags,
      positions: this.positions,
      reuse: this.reuse,
      sums: this.sums,
      homogeneous: !this.sums
    };
  }
  growNodes() {
    const size = this.op.length * 2;
    this.op = grow(this.op, size);
    this.dim = grow(this.dim, size);
    this.position = grow(this.position, size);
    this.tag = grow(this.tag, size);
    this.uses = grow(this.uses, size);
    this.childStart = grow(this.childStart, size + 1);
  }
};
var NetworkTooLarge = class extends Error {
  constructor(limit) {
    super(`the tensor network would exceed ${limit} nodes`);
    this.limit = limit;
  }
  limit;
  name = "NetworkTooLarge";
};
function grow(a, size) {
  const b = new a.constructor(size);
  b.set(a);
  return b;
}

// src/config/grid-geometry.ts
function extent(k, d) {
  return d * (k - 1) + 1;
}
function windowAxis(n, k, s, d, padding, axis) {
  const e = extent(k, d);
  switch (padding.mode) {
    case "same": {
      const out = Math.ceil(n / s);
      const total = Math.max((out - 1) * s + e - n, 0);
      return { out, left: Math.floor(total / 2) };
    }
    case "valid":
      if (n < e) return `a window spanning ${e} positions does not fit the ${n} positions of the grid without padding`;
      return { out: Math.floor((n - e) / s) + 1, left: 0 };
    case "causal":
      return { out: Math.floor((n - 1) / s) + 1, left: e - 1 };
    case "explicit": {
      const p = padding.amount[axis] ?? 0;
      if (n + 2 * p < e) return `a window spanning ${e} positions does not fit the ${n} positions of the grid with ${p} padding on each side`;
      return { out: Math.floor((n + 2 * p - e) / s) + 1, left: p };
    }
  }
}
function tapRange(j, n, k, s, d, left) {
  const base = j * s - left;
  const first = Math.max(0, Math.ceil(-base / d));
  const last = Math.min(k - 1, Math.floor((n - 1 - base) / d));
  return [first, last];
}
function windowTaps(j, n, k, s, d, left) {
  const [first, last] = tapRange(j, n, k, s, d, left);
  const at = [];
  for (let t = first; t <= last; t++) at.push(j * s - left + t * d);
  return at;
}
function windowTapIndices(j, n, k, s, d, left) {
  const [first, last] = tapRange(j, n, k, s, d, left);
  const taps = [];
  for (let t = first; t <= last; t++) taps.push(t);
  return taps;
}
function treeConvPositions(j, n, k, s, d, plan, causal) {
  const m = Math.min(k, s);
  const e = extent(k, d);
  const start = j * s - plan.left + (causal ? e - m : Math.floor((e - m) / 2));
  const at = [];
  for (let p = Math.max(start, 0); p < Math.min(start + m, n); p++) at.push(p);
  return at;
}
function transposeLength(n, k, s, d, padding, outputPadding) {
  return (n - 1) * s - 2 * padding + extent(k, d) + outputPadding;
}
function transposeSources(j, n, k, s, d, padding) {
  const out = [];
  const first = Math.max(0, Math.ceil((j + padding - (n - 1) * s) / d));
  const last = Math.min(k - 1, Math.floor((j + padding) / d));
  for (let t = first; t <= last; t++) {
    const num = j + padding - t * d;
    if (num % s !== 0) continue;
    out.push([num / s, t]);
  }
  return out;
}
function treeTransposeSource(j, n, s) {
  return [Math.min(Math.floor(j / s), n - 1), j % s];
}
function linearSources(j, n, f2) {
  const den = 2 * f2;
  const coord = 2 * j + 1 - f2;
  if (coord <= 0) return { i0: 0, i1: 0, num: 0, den };
  const i0 = Math.floor(coord / den);
  if (i0 >= n - 1) return { i0: n - 1, i1: n - 1, num: 0, den };
  return { i0, i1: i0 + 1, num: coord - i0 * den, den };
}

// src/config/model-shapes.ts
var MAX_WIDTH = 2 ** 31 - 1;
function inferShapes(model, adjust2) {
  const diagnostics = [];
  const fail2 = (span, code, message) => {
    diagnostics.push({ code, message, file: model.file, span, severity: "error" });
    return { ok: false, diagnostics };
  };
  const m = representationOf(model);
  if (m === void 0) {
    return fail2(
      model.input.span,
      "config/no-representation",
      "no layer maps the input to a width, so the number of representation functions per position cannot be defaulted; set input.representation"
    );
  }
  const out = [];
  const groups = [];
  const denseReading = [];
  const headDims = [];
  const rawInput = /* @__PURE__ */ new Set([INPUT]);
  const inShape = (i) => i === INPUT ? { shape: model.input.shape, width: m } : out[i];
  for (const written of model.layers) {
    const ins = written.inputs.map(inShape);
    const first = ins[0];
    const adjusted = adjust2 ? adjust2(written, first) : written;
    if ("code" in adjusted) return fail2(adjusted.span, adjusted.code, adjusted.message);
    const layer = adjusted;
    const where2 = `layer ${layerLabel(layer)} (line ${layer.span.line})`;
    const dims = first.shape.length;
    let result;
    groups.push(1);
    denseReading.push(void 0);
    headDims.push(0);
    switch (layer.kind) {
      case "conv": {
        const axes = perAxis(layer, first.shape);
        if (typeof axes === "string") return fail2(layer.fieldSpans["kernel"] ?? layer.span, "config/window-does-not-fit", `${where2}: ${axes}`);
        if (layer.padding.mode === "causal" && dims !== 1) {
          return fail2(layer.fieldSpans["padding"] ?? layer.span, "config/causal-needs-1d", `${where2}: causal padding needs a 1D grid, but the grid is [${first.shape.join(", ")}]`);
        }
        const g = convGroups(layer, first.width);
        if (typeof g === "string") return fail2(layer.fieldSpans["groups"] ?? layer.span, "config/groups", `${where2}: ${g}`);
        groups[layer.index] = g.groups;
        result = { shape: axes, width: g.channels };
        break;
      }
      case "conv-transpose": {
        const shape = first.shape.map(
          (n, a) => transposeLength(n, layer.kernel[a], layer.stride[a], layer.dilation[a], layer.padding[a], layer.outputPadding[a])
        );
        if (shape.some((n) => n < 1)) {
          return fail2(layer.fieldSpans["padding"] ?? layer.span, "config/window-does-not-fit", `${where2}: the output would have no positions ([${shape.join(", ")}]); reduce the padding`);
        }
        if (first.width % layer.groups !== 0 || layer.channels % layer.groups !== 0) {
          return fail2(layer.fieldSpans["groups"] ?? layer.span, "config/groups", `${where2}: groups ${layer.groups} must divide both the input width ${first.width} and the channels ${layer.channels}`);
        }
        groups[layer.index] = layer.groups;
        result = { shape, width: layer.channels };
        break;
      }
      case "pool": {
        if (layer.global) {
          result = { shape: first.shape.map(() => 1), width: first.width };
          break;
        }
        const shape = [];
        for (let a = 0; a < dims; a++) {
          const plan = windowAxis(first.shape[a], layer.window[a], layer.stride[a], 1, layer.padding, a);
          if (typeof plan === "string") return fail2(layer.fieldSpans["window"] ?? layer.span, "config/window-does-not-fit", `${where2}: ${plan}`);
          shape.push(plan.out);
        }
        result = { shape, width: first.width };
        break;
      }
      case "dense": {
        const single = positionCount(first.shape) === 1;
        const reading = single ? "vector" : layer.inputs.every((i) => rawInput.has(i)) ? "input" : "per-position";
        denseReading[layer.index] = reading;
        result = { shape: reading === "input" ? first.shape.map(() => 1) : first.shape, width: layer.units };
        break;
      }
      case "flatten":
        result = { shape: first.shape.map(() => 1), width: first.width * positionCount(first.shape) };
        break;
      case "upsample":
        result = { shape: first.shape.map((n, a) => n * layer.factor[a]), width: first.width };
        break;
      case "recurrent": {
        if (dims !== 1) {
          return fail2(layer.span, "config/recurrent-needs-1d", `${where2}: a recurrent layer needs a 1D sequence, but the grid is [${first.shape.join(", ")}] here`);
        }
        const width = layer.bidirectional && layer.merge === "concat" ? 2 * layer.hidden : layer.hidden;
        result = { shape: layer.sequence ? first.shape : [1], width };
        break;
      }
      case "embedding":
        result = { shape: first.shape, width: layer.dim };
        break;
      case "position":
        result = first;
        break;
      case "class-token":
        result = { shape: [positionCount(first.shape) + 1], width: first.width };
        break;
      case "attention": {
        const a = layer.headDim ?? first.width / layer.heads;
        if (!Number.isInteger(a) || a < 1) {
          return fail2(layer.fieldSpans["heads"] ?? layer.span, "config/attention-heads", `${where2}: ${layer.heads} heads do not divide the width ${first.width}; give head_dim`);
        }
        if (layer.window !== void 0 && dims !== 1) {
          return fail2(layer.fieldSpans["window"] ?? layer.span, "config/attention-window", `${where2}: a local window needs a 1D sequence, but the grid is [${first.shape.join(", ")}] here`);
        }
        headDims[layer.index] = a;
        result = first;
        break;
      }
      case "pointwise":
        result = first;
        if (layer.inputs.every((i) => rawInput.has(i))) rawInput.add(layer.index);
        break;
      case "merge": {
        const mismatch = ins.findIndex((s) => s.shape.length !== dims || s.shape.some((n, a) => n !== first.shape[a]));
        if (mismatch >= 0) {
          return fail2(layer.span, "config/merge-shape", `${where2}: the paths it ${layer.mode === "sum" ? "adds" : "joins"} end on different grids: ${ins.map((s) => `[${s.shape.join(", ")}]`).join(" and ")}${describeInputs(model, layer)}`);
        }
        if (layer.mode === "sum") {
          if (ins.some((s) => s.width !== first.width)) {
            return fail2(layer.span, "config/merge-width", `${where2}: the paths it adds have different widths ${ins.map((s) => s.width).join(" and ")}${describeInputs(model, layer)}; a sum needs equal widths (give the shortcut a 1×1 conv to the main path's width)`);
          }
          result = { shape: first.shape, width: first.width };
        } else {
          result = { shape: first.shape, width: ins.reduce((a, s) => a + s.width, 0) };
        }
        break;
      }
    }
    if (result.width > MAX_WIDTH) {
      return fail2(layer.span, "config/too-wide", `${where2}: its width ${result.width} is above the limit of ${MAX_WIDTH}`);
    }
    out.push(result);
  }
  const last = out[out.length - 1];
  const output = outputPosition(model, last.shape, out, denseReading);
  if (typeof output === "string") return fail2(model.output.span ?? model.span, "config/output-position", output);
  return { ok: true, shapes: { representation: m, layers: out, groups, denseReading, headDims, output } };
}
function perAxis(layer, shape) {
  const res = [];
  for (let a = 0; a < shape.length; a++) {
    const plan = windowAxis(shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], layer.padding, a);
    if (typeof plan === "string") return plan;
    res.push(plan.out);
  }
  return res;
}
function convGroups(layer, inWidth) {
  if (layer.groups === "depthwise") {
    const channels2 = layer.channels ?? inWidth * layer.depthMultiplier;
    if (channels2 % inWidth !== 0) return `a depthwise conv needs channels that are a multiple of its input width ${inWidth}, but has ${channels2}`;
    return { groups: inWidth, channels: channels2 };
  }
  const channels = layer.channels;
  if (inWidth % layer.groups !== 0 || channels % layer.groups !== 0) {
    return `groups ${layer.groups} must divide both the input width ${inWidth} and the channels ${channels}`;
  }
  return { groups: layer.groups, channels };
}
function describeInputs(model, layer) {
  const names = layer.inputs.map((i) => i === INPUT ? "the input" : `layer ${layerLabel(model.layers[i])} (line ${model.layers[i].span.line})`);
  return ` (from ${names.join(" and ")})`;
}
function outputPosition(model, shape, shapes, reading) {
  const given = model.output.position;
  if (given) {
    if (given.length !== shape.length) {
      return `output.position has ${given.length} entries, but the last layer's grid [${shape.join(", ")}] has ${shape.length} axes`;
    }
    const outside = given.findIndex((p, a) => p < 0 || p >= shape[a]);
    if (outside >= 0) return `output.position [${given.join(", ")}] is outside the last layer's grid [${shape.join(", ")}]`;
    return { position: given, defaulted: false };
  }
  const single = positionCount(shape) === 1;
  if (single) return { position: shape.map(() => 0), defaulted: false };
  if (shape.length === 1 && isCausal(model, shapes, reading)) return { position: [shape[0] - 1], defaulted: true };
  if (shape.length === 1 && model.layers.some((l) => l.kind === "class-token")) return { position: [0], defaulted: true };
  return { position: shape.map((n) => Math.floor(n / 2)), defaulted: true };
}
function isCausal(model, shapes, reading) {
  let mixing = 0;
  for (const l of model.layers) {
    let causal;
    switch (l.kind) {
      case "conv":
        if (l.kernel.every((k) => k === 1) && l.stride.every((s) => s === 1)) continue;
        causal = l.padding.mode === "causal";
        break;
      case "pool":
        if (!l.global && l.window.every((w) => w === 1) && l.stride.every((s) => s === 1)) continue;
        causal = false;
        break;
      case "recurrent":
        causal = !l.bidirectional;
        break;
      case "attention":
        causal = l.causal;
        break;
      case "dense":
        if (reading[l.index] !== "input") continue;
        causal = false;
        break;
      case "conv-transpose":
      case "upsample":
      case "class-token":
        causal = false;
        break;
      case "flatten":
        if (positionCount(l.inputs[0] === INPUT ? model.input.shape : shapes[l.inputs[0]].shape) === 1) continue;
        causal = false;
        break;
      default:
        continue;
    }
    if (!causal) return false;
    mixing++;
  }
  return mixing > 0;
}

// src/network/square-rule.ts
function readPointwise(model, shapes) {
  const layers = model.layers;
  const reachesWeighted = new Uint8Array(layers.length);
  for (let i = layers.length - 1; i >= 0; i--) {
    for (const j of layers[i].inputs) {
      if (j === INPUT) continue;
      if (WEIGHTED_KINDS.has(layers[i].kind) || reachesWeighted[i]) reachesWeighted[j] = 1;
    }
  }
  const nearest = (i) => {
    let activation = false;
    while (i !== INPUT && layers[i].kind === "pointwise") {
      const l = layers[i];
      if (l.kind === "pointwise" && l.family === "activation") activation = true;
      i = l.inputs[0];
    }
    return { at: i, activation };
  };
  const positionsBefore = (i) => positionCount(i === INPUT ? model.input.shape : shapes.layers[i].shape);
  const mixing = /* @__PURE__ */ new Set();
  const squared = /* @__PURE__ */ new Set();
  const ignored2 = /* @__PURE__ */ new Set();
  const mixes = (i) => {
    const { at } = nearest(i);
    return at !== INPUT && mixing.has(at);
  };
  for (const layer of layers) {
    if (layer.kind === "dense") {
      const reading = shapes.denseReading[layer.index];
      if (reading === "input") mixing.add(layer.index);
      else if (reading === "vector") {
        const { at } = nearest(layer.inputs[0]);
        const above = at === INPUT ? void 0 : layers[at];
        if (above?.kind === "flatten" && positionsBefore(above.inputs[0]) > 1) mixing.add(layer.index);
        else if (above && mixing.has(above.index)) mixing.add(layer.index);
      }
    } else if (layer.kind === "merge") {
      if (layer.inputs.every(mixes)) mixing.add(layer.index);
    } else if (layer.kind === "pointwise") {
      if (!reachesWeighted[layer.index]) {
        ignored2.add(layer.index);
        continue;
      }
      if (layer.family !== "activation") continue;
      const { at, activation } = nearest(layer.inputs[0]);
      if (!activation && at !== INPUT && mixing.has(at)) squared.add(layer.index);
    }
  }
  return { squared, ignored: ignored2, mixing };
}

// src/network/build-circuit.ts
var NODE_LIMIT = 4e6;
function buildCircuit(model, options) {
  const limit = options.nodeLimit ?? NODE_LIMIT;
  const shaped = inferShapes(model);
  if (!shaped.ok) return shaped;
  const shapes = shaped.shapes;
  const fail2 = (span, code, message) => ({
    ok: false,
    diagnostics: [{ code, message, file: model.file, span, severity: "error" }]
  });
  const tooLarge2 = () => fail2(
    model.input.fieldSpans["shape"] ?? model.input.span,
    "network/too-large",
    `this model's tensor network would exceed ${limit} nodes or ${limit * 4} links; analyse a smaller input shape`
  );
  let estimate = positionCount(model.input.shape);
  for (const s of shapes.layers) estimate += positionCount(s.shape);
  if (estimate > limit) return tooLarge2();
  const pointwise = readPointwise(model, shapes);
  const notes = new Notes(model, shapes, pointwise, options.surrogate);
  let capacity = positionCount(model.input.shape);
  for (const l of model.layers) if (l.kind !== "pointwise" && l.kind !== "flatten") capacity += positionCount(shapes.layers[l.index].shape);
  const b = new CircuitBuilder(positionCount(model.input.shape), limit, Math.min(capacity, limit));
  try {
    const inputTag = b.addTag({ label: "input", line: model.input.span.line, span: model.input.span, layerIndex: -1 });
    const m = shapes.representation;
    const input = { shape: model.input.shape, nodes: Array.from({ length: positionCount(model.input.shape) }, (_, p) => b.add(OP_INPUT, m, inputTag, [], p)), dim: m, flat: false };
    const grids = [];
    const gridOf = (i) => i === INPUT ? input : grids[i];
    const shared = new SharedMaps(b);
    for (const layer of model.layers) {
      const tag = b.addTag({ label: layerLabel(layer), line: layer.span.line, span: layer.span, layerIndex: layer.index });
      const built = buildLayer(b, layer, layer.inputs.map(gridOf), tag, options, shapes, pointwise, model.weightSharing ? shared : void 0);
      if ("code" in built) return fail2(built.span, built.code, built.message);
      grids.push(built);
    }
    const last = grids[grids.length - 1];
    const lastLayer = model.layers[model.layers.length - 1];
    let top;
    if (last.flat) {
      const headTag = b.addTag({ label: layerLabel(lastLayer), line: lastLayer.span.line, span: lastLayer.span, layerIndex: lastLayer.index });
      top = sumOf(b, 1, headTag, last.nodes);
    } else {
      top = last.nodes[flatIndex(last.shape, shapes.output.position)];
    }
    if (top === ZERO) {
      return fail2(
        lastLayer.span,
        "network/zero-output",
        `the analysed output is zero for every choice of weights: it reads only padding; reduce the padding or analyse another output position`
      );
    }
    return { ok: true, circuit: b.finish(top), notes: notes.list(), shapes, pointwise };
  } catch (e) {
    if (e instanceof NetworkTooLarge) return tooLarge2();
    throw e;
  }
}
function flatIndex(shape, at) {
  return shape.length === 1 ? at[0] : at[0] * shape[1] + at[1];
}
var ZERO = -2;
function linearOf(b, dim, tag, v) {
  return v === ZERO ? ZERO : b.add(OP_LINEAR, dim, tag, [v]);
}
var SharedMaps = class {
  constructor(b) {
    this.b = b;
  }
  b;
  stamp = new Int32Array(0);
  value = new Int32Array(0);
  layer = 0;
  /** The mapping for a new layer's matrix. */
  of(dim, tag) {
    const layer = ++this.layer;
    return (v) => {
      if (v === ZERO) return ZERO;
      if (v >= this.stamp.length) {
        const size = Math.max(1024, 2 * this.stamp.length, v + 1);
        const stamp = new Int32Array(size);
        stamp.set(this.stamp);
        const value = new Int32Array(size);
        value.set(this.value);
        this.stamp = stamp;
        this.value = value;
      }
      if (this.stamp[v] !== layer) {
        this.stamp[v] = layer;
        this.value[v] = this.b.add(OP_LINEAR, dim, tag, [v]);
      }
      return this.value[v];
    };
  }
};
function perPositionMaps(b, dim, tag, shared) {
  return shared ? shared.of(dim, tag) : (v) => linearOf(b, dim, tag, v);
}
function productOf(b, dim, tag, children) {
  if (children.includes(ZERO)) return ZERO;
  return children.length === 1 ? children[0] : b.add(OP_PRODUCT, dim, tag, children);
}
function sumOf(b, dim, tag, children) {
  const live = children.includes(ZERO) ? children.filter((v) => v !== ZERO) : children;
  if (live.length === 0) return ZERO;
  return b.add(live.length === 1 ? OP_LINEAR : OP_SUM, dim, tag, live);
}
function materialise(b, g, tag) {
  if (!g.flat) return g;
  return { shape: g.shape, nodes: [sumOf(b, g.dim * g.nodes.length, tag, g.nodes)], dim: g.dim * g.nodes.length, flat: false };
}
function buildLayer(b, layer, inputs, tag, options, shapes, pointwise, shared) {
  const out = shapes.layers[layer.index];
  const first = inputs[0];
  const surrogate = options.surrogate;
  const grouped = shapes.groups[layer.index] > 1 && options.groupedAsIdentity === true;
  if (grouped && out.width !== first.dim) {
    return { span: layer.span, code: "network/grouped-not-identity", message: `layer ${layerLabel(layer)}: a grouped map between widths ${first.dim} and ${out.width} is not the identity` };
  }
  switch (layer.kind) {
    case "pointwise": {
      if (!pointwise.squared.has(layer.index)) return first;
      const g = materialise(b, first, tag);
      return { ...g, nodes: g.nodes.map((v) => productOf(b, g.dim, tag, [v, v])) };
    }
    case "flatten":
      return { shape: out.shape, nodes: first.nodes, dim: first.dim, flat: true };
    case "dense": {
      const reading = shapes.denseReading[layer.index];
      if (first.flat || reading === "input") return { shape: out.shape, nodes: [sumOf(b, layer.units, tag, first.nodes)], dim: layer.units, flat: false };
      return { shape: out.shape, nodes: first.nodes.map(perPositionMaps(b, layer.units, tag, shared)), dim: layer.units, flat: false };
    }
    case "merge": {
      const grids = inputs.map((g) => materialise(b, g, tag));
      const nodes = grids[0].nodes.map((_, p) => sumOf(b, out.width, tag, grids.map((g) => g.nodes[p])));
      return { shape: out.shape, nodes, dim: out.width, flat: false };
    }
    case "recurrent":
      return recurrent(b, materialise(b, first, tag), layer, tag);
    case "embedding": {
      const g = materialise(b, first, tag);
      return { shape: out.shape, nodes: g.nodes.map(perPositionMaps(b, layer.dim, tag, shared ?? new SharedMaps(b))), dim: layer.dim, flat: false };
    }
    case "position": {
      const g = materialise(b, first, tag);
      return { ...g, nodes: g.nodes.map((v) => sumOf(b, g.dim, tag, [v, b.add(OP_CONST, g.dim, tag, [])])) };
    }
    case "class-token": {
      const g = materialise(b, first, tag);
      return { shape: out.shape, nodes: [b.add(OP_CONST, g.dim, tag, []), ...g.nodes], dim: g.dim, flat: false };
    }
    case "attention":
      return attention(b, materialise(b, first, tag), layer, shapes.headDims[layer.index], tag);
    case "pool":
      return pool(b, materialise(b, first, tag), layer, out.shape, tag);
    case "upsample":
      return upsample(b, materialise(b, first, tag), layer, out.shape, tag);
    case "conv":
      return conv(b, materialise(b, first, tag), layer, out.shape, out.width, tag, surrogate, grouped, shared);
    case "conv-transpose":
      return convTranspose(b, materialise(b, first, tag), layer, out.shape, tag, surrogate, grouped);
  }
}
function recurrent(b, g, layer, tag) {
  const R = layer.hidden;
  const chain2 = (inputs, backward2) => {
    const states = new Array(inputs.length);
    let prev = b.add(OP_CONST, R, tag, []);
    for (let k = 0; k < inputs.length; k++) {
      const t = backward2 ? inputs.length - 1 - k : k;
      prev = productOf(b, R, tag, [linearOf(b, R, tag, prev), linearOf(b, R, tag, inputs[t])]);
      states[t] = prev;
    }
    return states;
  };
  const width = layer.bidirectional && layer.merge === "concat" ? 2 * R : R;
  const join3 = (f2, bw) => sumOf(b, width, tag, [f2, bw]);
  let below = g.nodes;
  let forward = [];
  let backward = [];
  for (let l = 0; l < layer.depth; l++) {
    forward = chain2(below, false);
    if (layer.bidirectional) {
      backward = chain2(below, true);
      below = forward.map((f2, t) => join3(f2, backward[t]));
    } else below = forward;
  }
  if (layer.sequence) return { shape: g.shape, nodes: below, dim: width, flat: false };
  const last = layer.bidirectional ? join3(forward[forward.length - 1], backward[0]) : forward[forward.length - 1];
  return { shape: [1], nodes: [last], dim: width, flat: false };
}
function attention(b, g, layer, a, tag) {
  const D = g.dim;
  const n = g.nodes.length;
  const window = layer.window;
  const attends = (i, j) => (!layer.causal || j <= i) && (window === void 0 || Math.abs(i - j) <= window);
  const ha = layer.heads * a;
  const lifted = layer.heads * a * a;
  const kv = g.nodes.map(
    (v) => productOf(b, lifted, tag, [linearOf(b, lifted, tag, linearOf(b, ha, tag, v)), linearOf(b, lifted, tag, linearOf(b, ha, tag, v))])
  );
  const sums = new Array(n);
  if (window === void 0 && !layer.causal) {
    const all = sumOf(b, lifted, tag, kv);
    sums.fill(all);
  } else if (window === void 0) {
    let prefix = ZERO;
    for (let i = 0; i < n; i++) sums[i] = prefix = sumOf(b, lifted, tag, [prefix, kv[i]]);
  } else {
    for (let i = 0; i < n; i++) {
      const from = Math.max(0, i - window);
      const to = layer.causal ? i : Math.min(n - 1, i + window);
      const terms = [];
      for (let j = from; j <= to; j++) if (attends(i, j)) terms.push(kv[j]);
      sums[i] = sumOf(b, lifted, tag, terms);
    }
  }
  const nodes = g.nodes.map((v, i) => linearOf(b, D, tag, productOf(b, lifted, tag, [linearOf(b, lifted, tag, linearOf(b, ha, tag, v)), sums[i]])));
  return { shape: g.shape, nodes, dim: D, flat: false };
}
function eachOutput(inShape, outShape, axisList, visit3) {
  const lists = outShape.map((n, a) => Array.from({ length: n }, (_, j) => axisList(a, j)));
  if (outShape.length === 1) {
    for (let j = 0; j < outShape[0]; j++) {
      const problem = visit3(lists[0][j], j);
      if (problem) return problem;
    }
    return void 0;
  }
  const width = inShape[1];
  const buffers = [];
  for (let i = 0; i < outShape[0]; i++) {
    const rows = lists[0][i];
    for (let j = 0; j < outShape[1]; j++) {
      const cols = lists[1][j];
      const size = rows.length * cols.length;
      const positions = buffers[size] ??= new Array(size);
      let k = 0;
      for (const r of rows) for (const c of cols) positions[k++] = r * width + c;
      const problem = visit3(positions, i * outShape[1] + j);
      if (problem) return problem;
    }
  }
  return void 0;
}
function picker(nodeAt) {
  const buffers = [];
  return (positions) => {
    const out = buffers[positions.length] ??= new Array(positions.length);
    for (let i = 0; i < positions.length; i++) out[i] = nodeAt(positions[i]);
    return out;
  };
}
function plans(g, k, s, d, layer) {
  return g.shape.map((n, a) => windowAxis(n, k[a], s[a], d[a], layer.padding, a));
}
function emptyWindow(layer, shape, out) {
  const at = shape.length === 1 ? [out] : [Math.floor(out / shape[1]), out % shape[1]];
  return {
    span: layer.fieldSpans["padding"] ?? layer.span,
    code: "network/empty-window",
    message: `layer ${layerLabel(layer)} (line ${layer.span.line}): output position [${at.join(", ")}] reads only padding; reduce the padding or the stride`
  };
}
var productsByWindow = /* @__PURE__ */ new WeakMap();
function windowProducts(b) {
  let m = productsByWindow.get(b);
  if (!m) productsByWindow.set(b, m = /* @__PURE__ */ new Map());
  return m;
}
function pool(b, g, layer, shape, tag) {
  if (layer.global) {
    return { shape, nodes: [productOf(b, g.dim, tag, g.nodes)], dim: g.dim, flat: false };
  }
  const axisPlans2 = plans(g, layer.window, layer.stride, layer.window.map(() => 1), layer);
  const nodes = [];
  const pick = picker((p) => g.nodes[p]);
  const same3 = layer.window.some((w, a) => layer.stride[a] < w) ? windowProducts(b) : void 0;
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) => windowTaps(j, g.shape[a], layer.window[a], layer.stride[a], 1, axisPlans2[a].left),
    (positions, out) => {
      if (positions.length === 0) return emptyWindow(layer, shape, out);
      const key = same3 && pick(positions).join(",");
      const known = key === void 0 ? void 0 : same3.get(key);
      const node = known ?? productOf(b, g.dim, tag, pick(positions));
      if (key !== void 0 && known === void 0) same3.set(key, node);
      nodes.push(node);
      return void 0;
    }
  );
  return problem ?? { shape, nodes, dim: g.dim, flat: false };
}
function upsample(b, g, layer, shape, tag) {
  const nodes = [];
  const pick = picker((p) => g.nodes[p]);
  eachOutput(
    g.shape,
    shape,
    (a, j) => {
      const f2 = layer.factor[a];
      if (layer.mode === "nearest") return [Math.floor(j / f2)];
      const src = linearSources(j, g.shape[a], f2);
      return src.num === 0 ? [src.i0] : [src.i0, src.i1];
    },
    (positions) => {
      nodes.push(positions.length === 1 ? g.nodes[positions[0]] : sumOf(b, g.dim, tag, pick(positions)));
      return void 0;
    }
  );
  return { shape, nodes, dim: g.dim, flat: false };
}
function conv(b, g, layer, shape, width, tag, surrogate, identity, shared) {
  const axisPlans2 = plans(g, layer.kernel, layer.stride, layer.dilation, layer);
  const causal = layer.padding.mode === "causal";
  const nodes = [];
  if (surrogate === "overlap") {
    const pick2 = picker((p) => g.nodes[p]);
    const pointMap = shared && !identity && layer.kernel.every((k) => k === 1) ? shared.of(width, tag) : void 0;
    const problem2 = eachOutput(
      g.shape,
      shape,
      (a, j) => windowTaps(j, g.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], axisPlans2[a].left),
      (positions) => {
        nodes.push(pointMap && positions.length === 1 ? pointMap(g.nodes[positions[0]]) : sumOf(b, width, tag, pick2(positions)));
        return void 0;
      }
    );
    return problem2 ?? { shape, nodes, dim: width, flat: false };
  }
  const mapped = new Int32Array(g.nodes.length).fill(-1);
  const map = identity ? (v) => v : perPositionMaps(b, width, tag, shared);
  const mapOf = (p) => {
    if (mapped[p] === -1) mapped[p] = map(g.nodes[p]);
    return mapped[p];
  };
  const pick = picker(mapOf);
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) => treeConvPositions(j, g.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], axisPlans2[a], causal),
    (positions) => {
      nodes.push(positions.length === 0 ? ZERO : productOf(b, width, tag, pick(positions)));
      return void 0;
    }
  );
  return problem ?? { shape, nodes, dim: width, flat: false };
}
function convTranspose(b, g, layer, shape, tag, surrogate, identity) {
  const nodes = [];
  const pick = picker((p) => g.nodes[p]);
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) => surrogate === "overlap" ? transposeSources(j, g.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], layer.padding[a]).map(([i]) => i) : [treeTransposeSource(j, g.shape[a], layer.stride[a])[0]],
    (positions) => {
      nodes.push(identity && positions.length === 1 ? g.nodes[positions[0]] : sumOf(b, layer.channels, tag, pick(positions)));
      return void 0;
    }
  );
  return problem ?? { shape, nodes, dim: layer.channels, flat: false };
}
var Notes = class {
  out = [];
  constructor(model, shapes, pointwise, surrogate) {
    const where2 = (l) => `${l.kind === "pointwise" ? l.op : `layer ${layerLabel(l)}`} (line ${l.span.line})`;
    const input = model.input;
    if (input.representation === void 0 && input.vocabulary === void 0) {
      const from = firstMaps(model).find((l) => layerWidth(l) === shapes.representation);
      const which = from ? `layer ${layerLabel(from)} (line ${from.span.line})` : "the first layer";
      this.out.push(
        `M = ${shapes.representation} representation functions per input position: the width of ${which}, the first layer that maps the input; set input.representation to choose M`
      );
    }
    if (input.vocabulary !== void 0) {
      this.out.push(`token input: each position holds one of ${input.vocabulary} tokens, read as its indicator vector, so M = ${input.vocabulary}`);
    }
    const gated = [...new Set(model.layers.flatMap((l) => l.kind === "recurrent" && l.cell !== "arithmetic" ? [l.cell] : []))].sort();
    if (gated.length > 0) {
      this.out.push(`${gated.join(" and ")} layers are read as recurrent arithmetic circuits of the same width and depth (multiplicative integration): their gates are not modelled`);
    }
    if (model.layers.some((l) => l.kind === "attention")) {
      this.out.push("attention is read as linearised self-attention (softmax and normalisation removed): each layer is a polynomial of degree 3 in its input");
    }
    if (model.layers.some((l) => l.kind === "position" && l.mode === "fixed")) {
      this.out.push("fixed position encodings are read as learned position vectors: no lower bound is claimed through them");
    }
    if (input.featuresAsChannels) {
      const line = input.fieldSpans["channels"]?.line ?? input.span.line;
      this.out.push(
        `input.features (line ${line}) is read as the data's raw channel count, which does not limit the bound; earlier versions of rankfloor read it as M, which is now input.representation`
      );
    }
    if (surrogate === "tree" && model.layers.some((l) => (l.kind === "conv" || l.kind === "conv-transpose") && l.kernel.some((k, a) => k > l.stride[a]))) {
      this.out.push("the tree surrogate uses each convolution as a per-position map: kernels wider than their stride are not used by the bound");
    }
    const modes = [...new Set(model.layers.flatMap((l) => l.kind === "pool" && l.mode !== "product" ? [l.mode] : []))].sort();
    if (modes.length > 0) this.out.push(`${modes.join(" and ")} pooling is a product over each window in the arithmetic surrogate`);
    const identity = model.layers.filter((l) => l.kind === "pointwise" && !pointwise.squared.has(l.index) && !pointwise.ignored.has(l.index));
    if (identity.length > 0) {
      this.out.push(
        `pointwise layers read as the identity (in the arithmetic surrogate the only non-linearity is the product of pooling and recurrence): ${list(identity.map(where2))}`
      );
    }
    const squared = model.layers.filter((l) => pointwise.squared.has(l.index));
    if (squared.length > 0) {
      this.out.push(`activations after dense layers that mix positions are read as the elementwise square v ⊙ v, so that the fully connected part keeps a non-linearity: ${list(squared.map(where2))}`);
    }
    const ignored2 = model.layers.filter((l) => pointwise.ignored.has(l.index));
    if (ignored2.length > 0) this.out.push(`pointwise layers after the last weighted layer are not part of the analysed score: ${list(ignored2.map(where2))}`);
    for (const l of model.layers) {
      if (l.kind !== "dense") continue;
      const reading = shapes.denseReading[l.index];
      const before = l.inputs[0] === INPUT ? model.input.shape : shapes.layers[l.inputs[0]].shape;
      if (reading === "per-position") {
        const advice2 = before.length === 2 ? "; put flatten before it to read them all at once" : "";
        this.out.push(`dense layer ${layerLabel(l)} (line ${l.span.line}) acts on each of the ${positionCount(before)} positions of its grid separately, like a 1×1 convolution${advice2}`);
      } else if (reading === "input") {
        this.out.push(`dense layer ${layerLabel(l)} (line ${l.span.line}) reads all ${positionCount(before)} input positions at once (a fully connected layer on the raw input)`);
      }
    }
    if (model.layers.some((l) => l.kind === "upsample" && l.mode === "linear")) {
      this.out.push("linear upsampling is a fixed sum of neighbouring positions: no lower bound is claimed through it");
    }
    if (shapes.output.defaulted) {
      const last = shapes.layers[shapes.layers.length - 1].shape;
      this.out.push(
        `the analysed output is position [${shapes.output.position.join(", ")}] of the last layer's grid [${last.join(", ")}] (the default); set output.position to analyse another, or add a global pool`
      );
    } else if (model.output.position) {
      this.out.push(`the analysed output is position [${shapes.output.position.join(", ")}] (output.position)`);
    }
  }
  list() {
    return this.out;
  }
};
function list(items) {
  const max = 8;
  return items.length <= max ? items.join(", ") : `${items.slice(0, max).join(", ")} and ${items.length - max} more`;
}

// src/network/head-cone.ts
function headCone(c) {
  const n = c.size;
  const { childStart, childList } = c;
  const reached = new Uint8Array(n);
  reached[c.top] = 1;
  let size = 0;
  let links = 0;
  for (let v = c.top; v >= 0; v--) {
    if (reached[v] === 0) continue;
    size++;
    links += childStart[v + 1] - childStart[v];
    for (let i = childStart[v]; i < childStart[v + 1]; i++) reached[childList[i]] = 1;
  }
  if (size === n) return c;
  const index = new Int32Array(c.top + 1);
  const op = new Uint8Array(size);
  const dim = new Int32Array(size);
  const position = new Int32Array(size);
  const tag = new Int32Array(size);
  const bondTag = new Int32Array(size);
  const start = new Int32Array(size + 1);
  const list2 = new Int32Array(links);
  let k = 0;
  let m = 0;
  for (let v = 0; v <= c.top; v++) {
    if (reached[v] === 0) continue;
    index[v] = k;
    op[k] = c.op[v];
    dim[k] = c.dim[v];
    position[k] = c.position[v];
    tag[k] = c.tag[v];
    bondTag[k] = c.bondTag[v];
    start[k] = m;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) list2[m++] = index[childList[i]];
    k++;
  }
  start[size] = m;
  return { ...c, size, op, dim, position, tag, bondTag, childStart: start, childList: list2, top: size - 1 };
}

// src/cut/degree-bound.ts
var SAFE = 2 ** 52;
function degreeBound(c, side, reach = sideReach(c, side)) {
  if (!reach) return null;
  const { dep, paths } = reach;
  let best = null;
  for (const mask of [1, 2]) {
    const found = sweepOf(c, reach, mask).best;
    if (found && (!best || found.log < best.log)) best = { step: found.step, mask, log: found.log };
  }
  if (!best) return null;
  const degrees = frontierAt(c, dep, paths, best.mask, best.step);
  const rank = () => productTree([...degrees].map(([v, d]) => binomial(c.dim[v] + d - reach.exact[v], d)));
  return { log2: best.log, rank, counts: frontierCounts(c, degrees) };
}
function sideReach(c, side) {
  const n = c.size;
  const dep = new Uint8Array(n);
  const { op, childStart, childList } = c;
  for (let v = 0; v < n; v++) {
    if (op[v] === OP_INPUT) dep[v] = side[c.position[v]] === 1 ? 1 : 2;
    else if (op[v] !== OP_CONST) {
      let m = 0;
      for (let i = childStart[v]; i < childStart[v + 1]; i++) m |= dep[childList[i]];
      dep[v] = m;
    }
  }
  const paths = new Float64Array(n);
  const sumAbove = new Uint8Array(n);
  paths[c.top] = 1;
  for (let v = n - 1; v >= 0; v--) {
    const p = paths[v];
    if (p === 0) continue;
    if (p > SAFE) return null;
    const below = sumAbove[v] | (op[v] === OP_SUM ? 1 : 0);
    for (let i = childStart[v]; i < childStart[v + 1]; i++) {
      const ch = childList[i];
      paths[ch] = paths[ch] + p;
      sumAbove[ch] = sumAbove[ch] | below;
    }
  }
  const exact2 = new Uint8Array(n);
  for (let v = 0; v < n; v++) exact2[v] = paths[v] > 0 && sumAbove[v] === 0 ? 1 : 0;
  return { dep, paths, exact: exact2 };
}
function sideFrontiers(c, reach, mask, count, ends = true) {
  const steps = sweepOf(c, reach, mask).steps;
  const chosen = smallest(steps, count);
  if (ends) {
    for (const end of [steps[0], steps[steps.length - 1]]) if (end && !chosen.includes(end)) chosen.push(end);
  }
  let bySide = frontierCache.get(reach);
  if (!bySide) frontierCache.set(reach, bySide = [/* @__PURE__ */ new Map(), /* @__PURE__ */ new Map(), /* @__PURE__ */ new Map()]);
  const made = bySide[mask];
  const missing = chosen.map((s) => s.step).filter((step) => !made.has(step));
  if (missing.length > 0) for (const [step, f2] of frontiersAt(c, reach.dep, reach.paths, mask, missing)) made.set(step, f2);
  return chosen.map((s) => made.get(s.step));
}
function smallest(steps, count) {
  const out = [];
  if (count <= 0) return out;
  for (const s of steps) {
    if (out.length === count && s.log >= out[count - 1].log) continue;
    let i = out.length;
    while (i > 0 && out[i - 1].log > s.log) i--;
    out.splice(i, 0, s);
    if (out.length > count) out.pop();
  }
  return out;
}
var frontierCache = /* @__PURE__ */ new WeakMap();
function frontiersAt(c, dep, paths, mask, steps) {
  const { childStart, childList } = c;
  const wanted = [...new Set(steps)].sort((x, y) => x - y);
  const out = /* @__PURE__ */ new Map();
  const d = new Float64Array(c.size);
  let next = 0;
  for (let v = 0; v < c.size && next < wanted.length; v++) {
    if (dep[v] === mask && paths[v] !== 0) {
      for (let i = childStart[v]; i < childStart[v + 1]; i++) {
        const ch = childList[i];
        if (d[ch] > 0) d[ch] = d[ch] - paths[v];
      }
      d[v] = paths[v];
    }
    if (wanted[next] !== v) continue;
    const degrees = /* @__PURE__ */ new Map();
    for (let u = 0; u <= v; u++) if (d[u] > 0) degrees.set(u, d[u]);
    out.set(wanted[next++], degrees);
  }
  return out;
}
function frontierCounts(c, degrees) {
  const counts = /* @__PURE__ */ new Map();
  for (const [v] of degrees) {
    const tag = c.bondTag[v];
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, byDim = /* @__PURE__ */ new Map());
    byDim.set(c.dim[v], (byDim.get(c.dim[v]) ?? 0) + 1);
  }
  return counts;
}
var sweeps = /* @__PURE__ */ new WeakMap();
function sweepOf(c, reach, mask) {
  let bySide = sweeps.get(reach);
  if (!bySide) sweeps.set(reach, bySide = []);
  let done = bySide[mask];
  if (!done) {
    const steps = [];
    done = bySide[mask] = { best: sweep(c, reach, mask, steps), steps };
  }
  return done;
}
function sweep(c, reach, mask, all) {
  const { op, childStart, childList, dim } = c;
  const { dep, paths, exact: exact2 } = reach;
  const d = new Float64Array(c.size);
  const held = new Float64Array(c.size);
  const term = (v) => held[v] = log2Binomial(dim[v] + d[v] - exact2[v], d[v]);
  let inputsLeft = 0;
  for (let v = 0; v < c.size; v++) if (op[v] === OP_INPUT && dep[v] === mask && paths[v] > 0) inputsLeft++;
  if (inputsLeft === 0) return null;
  let total = 0;
  let best = null;
  for (let v = 0; v < c.size; v++) {
    if (dep[v] !== mask || paths[v] === 0) continue;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) {
      const ch = childList[i];
      if (d[ch] > 0) {
        total -= held[ch];
        d[ch] = d[ch] - paths[v];
        if (d[ch] > 0) total += term(ch);
      }
    }
    d[v] = paths[v];
    total += term(v);
    if (op[v] === OP_INPUT) inputsLeft--;
    if (inputsLeft === 0) all?.push({ step: v, log: total });
    if (inputsLeft === 0 && (!best || total < best.log - 1e-9)) best = { step: v, log: total };
  }
  return best;
}
function frontierAt(c, dep, paths, mask, step) {
  const { childStart, childList } = c;
  const d = new Float64Array(c.size);
  for (let v = 0; v <= step; v++) {
    if (dep[v] !== mask || paths[v] === 0) continue;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) {
      const ch = childList[i];
      if (d[ch] > 0) d[ch] = d[ch] - paths[v];
    }
    d[v] = paths[v];
  }
  const degrees = /* @__PURE__ */ new Map();
  for (let u = 0; u <= step; u++) if (d[u] > 0) degrees.set(u, d[u]);
  return degrees;
}
function log2Binomial(n, k) {
  if (k <= 0 || k >= n) return 0;
  return (lnFactorial(n) - lnFactorial(k) - lnFactorial(n - k)) / Math.LN2;
}
var TABLE_SIZE = 4096;
var LN_FACTORIAL = (() => {
  const t = new Float64Array(TABLE_SIZE);
  for (let i = 2; i < TABLE_SIZE; i++) t[i] = t[i - 1] + Math.log(i);
  return t;
})();
function lnFactorial(n) {
  if (n < TABLE_SIZE) return LN_FACTORIAL[n];
  const x = n + 1;
  return (x - 0.5) * Math.log(x) - x + 0.9189385332046728 + 1 / (12 * x) - 1 / (360 * x * x * x);
}
function productTree(xs) {
  if (xs.length === 0) return 1n;
  let level = xs;
  while (level.length > 1) {
    const next = [];
    for (let i = 0; i < level.length; i += 2) next.push(i + 1 < level.length ? level[i] * level[i + 1] : level[i]);
    level = next;
  }
  return level[0];
}
function powerSpan(k, count, cap) {
  const sym = binomial(k + count - 1, count);
  return sym < cap ? sym : cap;
}
function sylvesterPowerSpan(k, a, b, r) {
  return powerSpan(k, a, r) + powerSpan(k, b, r) - r;
}
function binomial(n, k) {
  if (k < 0 || k > n) return 0n;
  const kk = Math.min(k, n - k);
  let r = 1n;
  for (let i = 1; i <= kk; i++) r = r * BigInt(n - kk + i) / BigInt(i);
  return r;
}

// src/cut/tree-min-cut.ts
var A = 0;
var B = 1;
function treeMinCut(c, side, weight, options = {}) {
  const n = c.size;
  const sym = options.symmetric ? new SymmetricGroups(c, side) : void 0;
  const fa = new Float64Array(n);
  const fb = new Float64Array(n);
  const free = new Float64Array(n);
  const { op, childStart, childList } = c;
  const link = (v, s) => {
    if (op[v] === OP_PRODUCT) return Math.min(s === A ? fa[v] : fb[v], weight[v] + free[v]);
    return s === A ? Math.min(fa[v], fb[v] + weight[v]) : Math.min(fb[v], fa[v] + weight[v]);
  };
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]] === 1;
      fa[v] = onA ? 0 : Infinity;
      fb[v] = onA ? Infinity : 0;
      continue;
    }
    if (kind === OP_CONST) continue;
    let sa = 0;
    let sb = 0;
    let sf = 0;
    const end = childStart[v + 1];
    if (kind === OP_PRODUCT) {
      for (let i = childStart[v]; i < end; i++) {
        const ch = childList[i];
        sa += fa[ch];
        sb += fb[ch];
        sf += op[ch] === OP_PRODUCT ? free[ch] : Math.min(fa[ch], fb[ch]);
      }
      free[v] = sf;
      if (sym) {
        sa = sym.choose(v, A, sa, fa);
        sb = sym.choose(v, B, sb, fb);
      }
    } else {
      for (let i = childStart[v]; i < end; i++) {
        const ch = childList[i];
        sa += link(ch, A);
        sb += link(ch, B);
      }
    }
    fa[v] = sa;
    fb[v] = sb;
  }
  const top = c.top;
  const headA = link(top, A);
  const headB = link(top, B);
  const value = Math.min(headA, headB);
  if (!Number.isFinite(value)) throw new Error("tree min-cut: no finite cut (a bug in the circuit)");
  let counts;
  return {
    value,
    get counts() {
      return counts ??= recoverCut(c, weight, fa, fb, free, headA <= headB ? A : B, sym);
    }
  };
}
function symmetricGroupDim(d, a) {
  const r = binomial(d + a - 1, a);
  return r <= BigInt(Number.MAX_SAFE_INTEGER) ? Number(r) : void 0;
}
var SymmetricGroups = class {
  constructor(c, side) {
    this.c = c;
    this.dep = new Uint8Array(c.size);
    for (let v = 0; v < c.size; v++) {
      if (c.op[v] === OP_INPUT) this.dep[v] = side[c.position[v]] === 1 ? 1 : 2;
      else for (let i = c.childStart[v]; i < c.childStart[v + 1]; i++) this.dep[v] = this.dep[v] | this.dep[c.childList[i]];
    }
    this.used = [new Uint8Array(c.size), new Uint8Array(c.size)];
    this.groupDim = [new Float64Array(c.size), new Float64Array(c.size)];
  }
  c;
  dep;
  /** used[s][v]: with members on side s, window v cut its far-side group symmetrically. */
  used;
  /** groupDim[v]: the dimension of the symmetric index of window v's far-side group (per side). */
  groupDim;
  /** Children of window v that are pure on the side opposite to s and alike, or undefined. */
  group(v, s) {
    const far = s === A ? 2 : 1;
    const c = this.c;
    const members = [];
    for (let i = c.childStart[v]; i < c.childStart[v + 1]; i++) {
      const ch = c.childList[i];
      if (this.dep[ch] !== far || c.op[ch] === OP_PRODUCT) continue;
      const first = members[0];
      if (first !== void 0 && (c.op[ch] !== c.op[first] || c.tag[ch] !== c.tag[first] || c.dim[ch] !== c.dim[first])) return void 0;
      members.push(ch);
    }
    return members.length >= 2 ? members : void 0;
  }
  /**
   * The node of narrowest output along the chain of single-input linear maps below a child: the
   * child's function factors through it, f = L·g, so the group factors through Sym^a of g's space.
   */
  narrowest(child) {
    const c = this.c;
    let best = child;
    let v = child;
    while (c.op[v] === OP_LINEAR && c.childStart[v + 1] - c.childStart[v] === 1) {
      v = c.childList[c.childStart[v]];
      if (c.dim[v] < c.dim[best]) best = v;
    }
    return best;
  }
  /** The cost of window v with its members on side s: the plain sum, or the group cut if cheaper. */
  choose(v, s, plain, f2) {
    const g = this.group(v, s);
    if (!g) return plain;
    const dim = symmetricGroupDim(this.c.dim[this.narrowest(g[0])], g.length);
    if (dim === void 0) return plain;
    let groupOnS = 0;
    for (const ch of g) groupOnS += f2[ch];
    const alt = plain - groupOnS + Math.log2(dim);
    if (alt < plain - 1e-9) {
      this.used[s][v] = 1;
      this.groupDim[s][v] = dim;
      return alt;
    }
    return plain;
  }
};
function recoverCut(c, weight, fa, fb, free, headSide, sym) {
  const n = c.size;
  const { op, childStart, childList } = c;
  const linkA = new Float64Array(n);
  const linkB = new Float64Array(n);
  const tenA = new Float64Array(n);
  const tenB = new Float64Array(n);
  const freeCnt = new Float64Array(n);
  const counts = /* @__PURE__ */ new Map();
  const addCut = (v, k) => {
    const tag = c.bondTag[v];
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, byDim = /* @__PURE__ */ new Map());
    byDim.set(c.dim[v], (byDim.get(c.dim[v]) ?? 0) + k);
  };
  const addGroup = (members, dim, k) => {
    const first = members.values().next().value;
    const tag = c.bondTag[sym.narrowest(first)];
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, byDim = /* @__PURE__ */ new Map());
    byDim.set(dim, (byDim.get(dim) ?? 0) + k);
  };
  (headSide === A ? linkA : linkB)[c.top] = 1;
  for (let v = n - 1; v >= 0; v--) {
    const kind = op[v];
    const la = linkA[v];
    const lb = linkB[v];
    if (kind === OP_PRODUCT) {
      let onA = tenA[v];
      let onB = tenB[v];
      let fr = freeCnt[v];
      const cutCost = weight[v] + free[v];
      if (la > 0) {
        if (fa[v] <= cutCost) onA += la;
        else {
          addCut(v, la);
          fr += la;
        }
      }
      if (lb > 0) {
        if (fb[v] <= cutCost) onB += lb;
        else {
          addCut(v, lb);
          fr += lb;
        }
      }
      if (onA === 0 && onB === 0 && fr === 0) continue;
      const groupA = onA > 0 && sym?.used[A][v] ? new Set(sym.group(v, A)) : void 0;
      const groupB = onB > 0 && sym?.used[B][v] ? new Set(sym.group(v, B)) : void 0;
      if (groupA) addGroup(groupA, sym.groupDim[A][v], onA);
      if (groupB) addGroup(groupB, sym.groupDim[B][v], onB);
      const end2 = childStart[v + 1];
      for (let i = childStart[v]; i < end2; i++) {
        const ch = childList[i];
        if (groupA?.has(ch)) tenB[ch] = tenB[ch] + onA;
        else tenA[ch] = tenA[ch] + onA;
        if (groupB?.has(ch)) tenA[ch] = tenA[ch] + onB;
        else tenB[ch] = tenB[ch] + onB;
        if (fr > 0) {
          if (op[ch] === OP_PRODUCT) freeCnt[ch] = freeCnt[ch] + fr;
          else if (fa[ch] <= fb[ch]) tenA[ch] = tenA[ch] + fr;
          else tenB[ch] = tenB[ch] + fr;
        }
      }
      continue;
    }
    let ta = tenA[v];
    let tb = tenB[v];
    const w = weight[v];
    if (la > 0) {
      if (fa[v] <= fb[v] + w) ta += la;
      else {
        tb += la;
        addCut(v, la);
      }
    }
    if (lb > 0) {
      if (fb[v] <= fa[v] + w) tb += lb;
      else {
        ta += lb;
        addCut(v, lb);
      }
    }
    if (kind === OP_INPUT || kind === OP_CONST) continue;
    const end = childStart[v + 1];
    for (let i = childStart[v]; i < end; i++) {
      const ch = childList[i];
      linkA[ch] = linkA[ch] + ta;
      linkB[ch] = linkB[ch] + tb;
    }
  }
  return counts;
}

// src/cut/graded-degree.ts
var MAX_DEGREE = 4096;
var MAX_WORK = 3e5;
function totalDegrees(c) {
  const { op, childStart, childList } = c;
  const deg = new Int32Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) deg[v] = 1;
    else if (kind === OP_CONST) deg[v] = 0;
    else {
      let d = kind === OP_PRODUCT ? 0 : -2;
      for (let i = childStart[v]; i < childStart[v + 1] && d !== -1; i++) {
        const g = deg[childList[i]];
        if (g < 0) d = -1;
        else if (kind === OP_PRODUCT) d = Math.min(d + g, MAX_DEGREE + 1);
        else if (kind === OP_LINEAR || d === -2) d = g;
        else if (d !== g) d = -1;
      }
      deg[v] = d === -2 ? 0 : d;
    }
  }
  return deg;
}
var FRONTIERS = 4;
function gradedDegreeBound(c, reach, deg) {
  const n = deg[c.top];
  if (n < 0 || n > MAX_DEGREE) return null;
  const fa = sideFrontiers(c, reach, 1, FRONTIERS);
  const a = perDegreeMin(fa.map((f2) => gradeCounts(c, f2, deg, n, reach.exact)));
  const b = a && perDegreeMin(sideFrontiers(c, reach, 2, FRONTIERS).map((f2) => gradeCounts(c, f2, deg, n, reach.exact)));
  if (!a || !b) return null;
  let rank = 0n;
  for (let e = 0; e <= n; e++) rank += a[e] < b[n - e] ? a[e] : b[n - e];
  return rank === 0n ? null : { rank, counts: frontierCounts(c, fa[0]) };
}
function perDegreeMin(all) {
  let out = null;
  for (const counts of all) {
    if (!counts) continue;
    if (!out) out = [...counts];
    else for (let e = 0; e < out.length; e++) if (counts[e] < out[e]) out[e] = counts[e];
  }
  return out;
}
function gradeCounts(c, frontier, deg, n, exact2) {
  let counts = new Float64Array(n + 1);
  let next = new Float64Array(n + 1);
  counts[0] = 1;
  let top = 0;
  let work = 0;
  const monomials = [];
  for (const [v, d] of frontier) {
    const g = deg[v];
    if (g <= 0) return null;
    const dim = c.dim[v];
    const lo = exact2[v] ? d : 0;
    const hi = Math.min(d, Math.floor(n / g));
    if (lo > hi) return null;
    monomials.length = 0;
    monomials.push(1);
    for (let e = 1; e <= hi; e++) {
      const product = monomials[e - 1] * (dim + e - 1);
      if (product >= EXACT) return null;
      monomials.push(product / e);
    }
    work += (top + 1) * (hi - lo + 1);
    if (work > MAX_WORK) return null;
    next.fill(0, 0, Math.min(n, top + hi * g) + 1);
    let nextTop = 0;
    for (let x = 0; x <= top; x++) {
      const cx = counts[x];
      if (cx === 0) continue;
      for (let e = lo; e <= hi; e++) {
        const y = x + e * g;
        if (y > n) break;
        const sum = next[y] + cx * monomials[e];
        if (sum >= EXACT) return null;
        next[y] = sum;
        if (y > nextTop) nextTop = y;
      }
    }
    [counts, next] = [next, counts];
    top = nextTop;
  }
  counts.fill(0, top + 1);
  return Array.from(counts, (x) => BigInt(x));
}
var EXACT = 2 ** 53;

// src/cut/types.ts
var MAX_RANK_BITS = 4e6;
var HUGE_RANK = 1n << BigInt(MAX_RANK_BITS);
function boundsMeet(lower, upper) {
  return !lower.huge && !upper.huge && lower.rank === upper.rank;
}
function log2Big(x) {
  if (x <= 0n) throw new RangeError("log2Big needs a positive integer");
  const bits = x.toString(2).length;
  if (bits <= 52) return Math.log2(Number(x));
  const shift = BigInt(bits - 52);
  return Math.log2(Number(x >> shift)) + Number(shift);
}

// src/cut/partner-ideal.ts
var FRONTIERS2 = 4;
var MAX_VISITS = 1e4;
var MAX_CONE = 2048;
function partnerIdealBound(c, reach) {
  const scratch = () => scratchOf(c);
  const budget = { visits: MAX_VISITS };
  const sides = [1, 2].filter((mask) => hasExactPure(c, reach, mask)).map((mask) => ({ mask, frontiers: sideFrontiers(c, reach, mask, FRONTIERS2, false) })).filter((s) => s.frontiers.length > 0);
  if (sides.length === 0) return null;
  const degreeLog = (f2) => {
    let sum = 0;
    for (const [v, d] of f2) sum += log2Binomial(c.dim[v] + d - reach.exact[v], d);
    return sum;
  };
  const logs = sides.map((s) => degreeLog(s.frontiers[0]));
  if (logs.length === 2 && logs[1] < logs[0]) sides.reverse();
  let best = null;
  for (const { mask, frontiers } of sides) {
    for (const frontier2 of frontiers) {
      const found = frontierBound(c, reach, frontier2, mask, scratch, budget, Math.min(best?.log2 ?? Infinity, ...logs));
      if (found && (!best || found.log2 < best.log2)) best = found;
      if (budget.visits <= 0) break;
    }
  }
  if (!best) return null;
  const { frontier, factor, others } = best;
  const rank = () => factor * productTree([...frontier].filter(([f2]) => !others.has(f2)).map(([f2, d]) => forms(c.dim[f2], d)));
  return { log2: best.log2, rank, counts: frontierCounts(c, frontier) };
}
function hasExactPure(c, reach, mask) {
  for (let v = 0; v < c.size; v++) if (reach.dep[v] === mask && reach.exact[v]) return true;
  return false;
}
function frontierBound(c, reach, frontier, mask, scratchFor, budget, threshold) {
  const { op, dim } = c;
  for (const [f2] of frontier) if (!reach.exact[f2]) return null;
  const logForms = (f2, d) => log2Binomial(dim[f2] + d - 1, d);
  let logAll;
  let best = null;
  for (const [w, dw] of frontier) {
    if (dw !== 1 || budget.visits <= 0) continue;
    const scratch = scratchFor();
    const { parent } = scratch;
    let v = w;
    while (parent[v] >= 0 && op[parent[v]] === OP_LINEAR) v = parent[v];
    const q = parent[v];
    if (q < 0 || op[q] !== OP_PRODUCT) continue;
    const partner = partnerOf(c, reach, frontier, mask, q, v, scratch, budget);
    if (!partner || partner.e.size === 0 || partner.e.has(w)) continue;
    let logFull = 0;
    let logOnce = 0;
    for (const [f2, e] of partner.e) {
      const d = frontier.get(f2);
      logFull += logForms(f2, d);
      logOnce += logForms(f2, d - e);
    }
    logAll ??= [...frontier].reduce((sum, [f2, d]) => sum + logForms(f2, d), 0);
    const logRest = logAll - logForms(w, 1) - logFull;
    const floor2 = Math.min(Math.log2(dim[q]) + logOnce, Math.log2(dim[w]) + logFull) + logRest;
    if (floor2 >= Math.min(threshold, best?.log2 ?? Infinity) - 1e-9) continue;
    let full = 1n;
    let once = 1n;
    let twice = 1n;
    for (const [f2, e] of partner.e) {
      const d = frontier.get(f2);
      full *= forms(dim[f2], d);
      once *= forms(dim[f2], d - e);
      twice *= forms(dim[f2], d - 2 * e);
    }
    const m = partner.m;
    let ideal;
    const single = partner.e.size === 1 ? [...partner.e][0] : void 0;
    if (single && single[1] === 1) {
      const f2 = single[0];
      const k = m < BigInt(dim[f2]) ? Number(m) : dim[f2];
      ideal = full - forms(dim[f2] - k, frontier.get(f2));
    } else if (m === 1n) {
      ideal = once;
    } else {
      ideal = m * once - twice;
    }
    if (ideal > full) ideal = full;
    const factor = BigInt(dim[q]) * ideal;
    const plain = BigInt(dim[w]) * full;
    if (factor >= plain) continue;
    const log2 = log2Big(factor) + logRest;
    if (!best || log2 < best.log2) best = { log2, frontier, factor, others: /* @__PURE__ */ new Set([w, ...partner.e.keys()]) };
  }
  return best;
}
function partnerOf(c, reach, frontier, mask, q, via, scratch, budget) {
  const { op, childStart, childList } = c;
  const { dep } = reach;
  const { mark, paths, span } = scratch;
  const far = 3 - mask;
  const stamp = ++scratch.stamp;
  const cone = [];
  const stack = [];
  const leaf = (v) => frontier.has(v) || dep[v] === 0 || dep[v] === far;
  let skipped = false;
  for (let i = childStart[q]; i < childStart[q + 1]; i++) {
    const ch = childList[i];
    if (ch === via && !skipped) {
      skipped = true;
      continue;
    }
    if (mark[ch] !== stamp) {
      mark[ch] = stamp;
      paths[ch] = 0;
      stack.push(ch);
    }
    paths[ch] = paths[ch] + 1;
  }
  while (stack.length > 0) {
    const v = stack.pop();
    if (--budget.visits < 0 || cone.length >= MAX_CONE) return null;
    cone.push(v);
    if (leaf(v)) continue;
    if (op[v] === OP_INPUT || op[v] === OP_SUM) return null;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) {
      const ch = childList[i];
      if (mark[ch] !== stamp) {
        mark[ch] = stamp;
        paths[ch] = 0;
        stack.push(ch);
      }
    }
  }
  cone.sort((a, b) => b - a);
  const e = /* @__PURE__ */ new Map();
  let m = 1n;
  for (const v of cone) {
    const p = paths[v];
    if (frontier.has(v)) e.set(v, p);
    else if (dep[v] === far) m *= forms(span[v], p);
    else if (dep[v] !== 0) {
      for (let i = childStart[v]; i < childStart[v + 1]; i++) paths[childList[i]] = paths[childList[i]] + p;
    }
  }
  return { e, m };
}
function forms(D, d) {
  if (d < 0) return 0n;
  if (d === 0) return 1n;
  return binomial(D + d - 1, d);
}
var scratches = /* @__PURE__ */ new WeakMap();
function scratchOf(c) {
  let s = scratches.get(c);
  if (s) return s;
  const parent = new Int32Array(c.size).fill(-1);
  const seen = new Uint8Array(c.size);
  const span = new Float64Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const kind = c.op[v];
    let x = kind === OP_INPUT ? c.dim[v] : kind === OP_CONST ? 1 : kind === OP_PRODUCT ? 1 : 0;
    for (let i = c.childStart[v]; i < c.childStart[v + 1]; i++) {
      const ch = c.childList[i];
      parent[ch] = seen[ch] ? -1 : v;
      seen[ch] = 1;
      x = kind === OP_PRODUCT ? x * span[ch] : x + span[ch];
    }
    span[v] = Math.min(x, c.dim[v]);
  }
  s = { parent, span, mark: new Int32Array(c.size), paths: new Float64Array(c.size), stamp: 0 };
  scratches.set(c, s);
  return s;
}

// src/cut/power-rounding.ts
var MAX_CANDIDATES = 64;
function floorLog(d, q) {
  const big2 = BigInt(d);
  const base = BigInt(q);
  let e = 0;
  for (let p = base; p <= big2; p *= base) e++;
  return e;
}
function integerRoot(d, k) {
  const big2 = BigInt(d);
  const kk = BigInt(k);
  let r = Math.max(1, Math.floor(Math.pow(d, 1 / k)));
  while (BigInt(r + 1) ** kk <= big2) r++;
  while (r > 1 && BigInt(r) ** kk > big2) r--;
  return r;
}
function powerCandidates(dims) {
  const distinct = [...new Set(dims)].filter((d) => d >= 2).sort((a, b) => b - a);
  const out = /* @__PURE__ */ new Set([2]);
  const maxK = distinct.length === 0 ? 0 : Math.floor(Math.log2(distinct[0])) + 1;
  for (let k = 1; k <= maxK && out.size < MAX_CANDIDATES; k++) {
    for (const d of distinct) {
      if (out.size >= MAX_CANDIDATES) break;
      if (2 ** k > d) continue;
      const r = integerRoot(d, k);
      if (r >= 2) out.add(r);
    }
  }
  return [...out];
}

// src/cut/max-flow.ts
var RELATIVE_EPSILON = 1e-12;
var FlowNetwork = class {
  nodeCount;
  // Arc i and arc i ^ 1 are each other's reverse; `next` threads each node's arcs into a list.
  to = [];
  cap = [];
  next = [];
  head;
  constructor(nodeCount) {
    if (!Number.isInteger(nodeCount) || nodeCount < 0) {
      throw new RangeError(`FlowNetwork needs a non-negative integer node count, got ${nodeCount}`);
    }
    this.nodeCount = nodeCount;
    this.head = new Int32Array(nodeCount).fill(-1);
  }
  /** Number of directed arcs, counting an undirected edge as two. */
  get arcCount() {
    return this.to.length;
  }
  /** A directed arc u → v of capacity cap (≥ 0, may be +Infinity). */
  addArc(u, v, cap) {
    this.push(u, v, cap, 0);
  }
  /**
   * An undirected edge: capacity cap in each direction. One arc pair whose two halves both carry
   * cap is equivalent to two opposite arcs and keeps the graph half the size.
   */
  addUndirected(u, v, cap) {
    this.push(u, v, cap, cap);
  }
  push(u, v, forward, backward) {
    this.checkNode(u);
    this.checkNode(v);
    if (!(forward >= 0)) throw new RangeError(`capacity must be >= 0 (or Infinity), got ${forward}`);
    const i = this.to.length;
    this.to.push(v, u);
    this.cap.push(forward, backward);
    this.next.push(this.head[u], this.head[v]);
    this.head[u] = i;
    this.head[v] = i + 1;
  }
  checkNode(v) {
    if (!Number.isInteger(v) || v < 0 || v >= this.nodeCount) {
      throw new RangeError(`node ${v} is outside 0..${this.nodeCount - 1}`);
    }
  }
  /** Max flow from s to t. The network itself is not changed, so it can be solved again. */
  maxFlow(s, t) {
    this.checkNode(s);
    this.checkNode(t);
    if (s === t) throw new RangeError("max flow needs distinct source and sink");
    const n = this.nodeCount;
    const m = this.to.length;
    const to = Int32Array.from(this.to);
    const next = Int32Array.from(this.next);
    const head = this.head;
    const res = Float64Array.from(this.cap);
    let largest = 0;
    for (let i = 0; i < m; i++) {
      const c = res[i];
      if (c !== Infinity && c > largest) largest = c;
    }
    const eps = largest * RELATIVE_EPSILON;
    const level = new Int32Array(n);
    const queue = new Int32Array(n);
    const iter = new Int32Array(n);
    const path = new Int32Array(n);
    let value = 0;
    const bfs = () => {
      level.fill(-1);
      level[s] = 0;
      queue[0] = s;
      let qh = 0;
      let qt = 1;
      while (qh < qt) {
        const u = queue[qh++];
        for (let e = head[u]; e >= 0; e = next[e]) {
          const v = to[e];
          if (level[v] < 0 && res[e] > eps) {
            level[v] = level[u] + 1;
            queue[qt++] = v;
          }
        }
      }
      return level[t] >= 0;
    };
    while (bfs()) {
      iter.set(head);
      let depth = 0;
      let u = s;
      for (; ; ) {
        if (u === t) {
          let f2 = Infinity;
          for (let k = 0; k < depth; k++) f2 = Math.min(f2, res[path[k]]);
          if (f2 === Infinity) {
            return { value: Infinity, sourceSide: this.reach(s, res, eps) };
          }
          value += f2;
          let back = -1;
          for (let k = 0; k < depth; k++) {
            const e2 = path[k];
            res[e2] = res[e2] - f2;
            res[e2 ^ 1] = res[e2 ^ 1] + f2;
            if (back < 0 && res[e2] <= eps) back = k;
          }
          depth = back;
          u = depth === 0 ? s : to[path[depth - 1]];
          continue;
        }
        let e = iter[u];
        while (e >= 0 && !(res[e] > eps && level[to[e]] === level[u] + 1)) e = next[e];
        iter[u] = e;
        if (e >= 0) {
          path[depth++] = e;
          u = to[e];
          continue;
        }
        level[u] = -1;
        if (depth === 0) break;
        const last = path[--depth];
        u = to[last ^ 1];
        iter[u] = next[iter[u]];
      }
    }
    return { value, sourceSide: this.reach(s, res, eps) };
  }
  reach(s, res, eps) {
    const seen = new Uint8Array(this.nodeCount);
    const stack = [s];
    seen[s] = 1;
    while (stack.length > 0) {
      const u = stack.pop();
      for (let e = this.head[u]; e >= 0; e = this.next[e]) {
        const v = this.to[e];
        if (!seen[v] && res[e] > eps) {
          seen[v] = 1;
          stack.push(v);
        }
      }
    }
    return seen;
  }
};

// src/cut/hypergraph-cut.ts
function minHyperCut(nodeCount, hyperedges, sideA, sideB) {
  const tie = new Uint8Array(nodeCount);
  for (const v of sideA) {
    checkNode(v, nodeCount);
    tie[v] = 1;
  }
  for (const v of sideB) {
    checkNode(v, nodeCount);
    if (tie[v] === 1) throw new RangeError(`node ${v} is tied to both sides`);
    tie[v] = 2;
  }
  const distinct = hyperedges.map((h, i) => {
    if (!(h.weight >= 0) || h.weight === Infinity) {
      throw new RangeError(`hyperedge ${i} needs a finite weight >= 0, got ${h.weight}`);
    }
    for (const v of h.members) checkNode(v, nodeCount);
    return [...new Set(h.members)];
  });
  let gadgets = 0;
  for (const m of distinct) if (m.length >= 3) gadgets++;
  const source = nodeCount + 2 * gadgets;
  const sink = source + 1;
  const net = new FlowNetwork(sink + 1);
  let nextGadget = nodeCount;
  distinct.forEach((members, i) => {
    const w = hyperedges[i].weight;
    if (members.length === 2) {
      net.addUndirected(members[0], members[1], w);
    } else if (members.length >= 3) {
      const u = nextGadget++;
      const v = nextGadget++;
      net.addArc(u, v, w);
      for (const x of members) {
        net.addArc(x, u, Infinity);
        net.addArc(v, x, Infinity);
      }
    }
  });
  for (let v = 0; v < nodeCount; v++) {
    if (tie[v] === 1) net.addArc(source, v, Infinity);
    else if (tie[v] === 2) net.addArc(v, sink, Infinity);
  }
  const flow = net.maxFlow(source, sink);
  if (flow.value === Infinity) throw new Error("hypergraph cut: no finite cut exists (bug: every weight is finite)");
  const side = flow.sourceSide.slice(0, nodeCount);
  const cutEdges = [];
  let value = 0;
  distinct.forEach((members, i) => {
    let a = false;
    let b = false;
    for (const x of members) {
      if (side[x]) a = true;
      else b = true;
    }
    if (a && b) {
      cutEdges.push(i);
      value += hyperedges[i].weight;
    }
  });
  const tolerance = 1e-9 * Math.max(1, Math.abs(flow.value));
  if (Math.abs(value - flow.value) > tolerance) {
    throw new Error(`hypergraph cut: split weight ${value} differs from flow ${flow.value} (bug)`);
  }
  return { value, cutEdges, side };
}
function checkNode(v, nodeCount) {
  if (!Number.isInteger(v) || v < 0 || v >= nodeCount) {
    throw new RangeError(`node ${v} is outside 0..${nodeCount - 1}`);
  }
}

// src/cut/explicit-bounds.ts
function explicitBounds(model, partition) {
  const net = buildNetwork(model, partition);
  const upperCut = cut(net, net.edges.map((e) => Math.log2(e.dim)));
  let upperRank = 1n;
  for (const i of upperCut) upperRank *= BigInt(net.edges[i].dim);
  const upper = {
    rank: upperRank,
    log2: log2Big(upperRank),
    method: "min-cut",
    cut: entries(upperCut.map((i) => ({ edge: net.edges[i], dim: net.edges[i].dim })))
  };
  if (!net.lowerRuleApplies) return { upper, lower: null };
  let lower = null;
  for (const q of powerCandidates(net.edges.map((e) => e.dim))) {
    const exps = net.edges.map((e) => floorLog(e.dim, q));
    const found = cut(net, exps);
    const c = found.reduce((s, i) => s + exps[i], 0);
    const rank = BigInt(q) ** BigInt(c);
    if (lower === null || rank > lower.rank) {
      lower = {
        rank,
        log2: log2Big(rank),
        method: `power-rounding q=${q}`,
        cut: entries(found.filter((i) => exps[i] > 0).map((i) => ({ edge: net.edges[i], dim: q ** exps[i] })))
      };
      if (rank === upperRank) break;
    }
  }
  if (lower !== null && lower.rank > upperRank) {
    throw new Error(`explicit bounds: lower ${lower.rank} exceeds upper ${upperRank} (bug)`);
  }
  return { upper, lower };
}
function buildNetwork(model, partition) {
  const index = /* @__PURE__ */ new Map();
  model.tensors.forEach((t, i) => {
    if (index.has(t.name)) throw new Error(`explicit network: tensor '${t.name}' is defined twice`);
    index.set(t.name, i);
  });
  const edges = [];
  const sideA = [];
  const sideB = [];
  let next = model.tensors.length;
  model.tensors.forEach((t, i) => {
    for (const leg of t.legs) {
      const p = leg.position;
      if (!Number.isInteger(p) || p < 0 || p >= partition.side.length) {
        throw new RangeError(`explicit network: tensor '${t.name}' has a leg at position ${p}, outside the partition`);
      }
      const terminal = next++;
      (partition.side[p] === 1 ? sideA : sideB).push(terminal);
      edges.push({ members: [i, terminal], dim: checkDim(leg.dim), label: "legs", line: t.span.line });
    }
  });
  const parent = [];
  const find = (x) => {
    while (parent[x] !== x) {
      const up = parent[x];
      parent[x] = parent[up];
      x = up;
    }
    return x;
  };
  const fresh = () => {
    parent.push(parent.length);
    return parent.length - 1;
  };
  for (let i = 0; i < model.tensors.length; i++) fresh();
  let hyper = false;
  let cycle = false;
  const join3 = (a, b) => {
    const ra = find(a);
    const rb = find(b);
    if (ra === rb) cycle = true;
    else parent[ra] = rb;
  };
  for (const bond of model.bonds) {
    if (bond.tensors.length === 0) throw new Error("explicit network: a bond joins no tensor");
    const members = bond.tensors.map((name) => {
      const i = index.get(name);
      if (i === void 0) throw new Error(`explicit network: a bond names unknown tensor '${name}'`);
      return i;
    });
    if (members.length >= 3) {
      hyper = true;
      const h = fresh();
      for (const m of members) join3(h, m);
    } else if (members.length === 2) {
      join3(members[0], members[1]);
    } else {
      cycle = true;
    }
    edges.push({ members, dim: checkDim(bond.dim), label: `bond ${bond.tensors.join("-")}`, line: bond.span.line });
  }
  return { nodeCount: next, edges, sideA, sideB, lowerRuleApplies: !hyper || !cycle };
}
function checkDim(d) {
  if (!Number.isSafeInteger(d) || d < 1) throw new RangeError(`explicit network: dimension ${d} is not a positive integer`);
  return d;
}
function cut(net, weights) {
  const hyperedges = net.edges.map((e, i) => ({ members: e.members, weight: weights[i] }));
  return minHyperCut(net.nodeCount, hyperedges, net.sideA, net.sideB).cutEdges;
}
function entries(cutEdges) {
  const groups = /* @__PURE__ */ new Map();
  for (const { edge, dim } of cutEdges) {
    if (dim === 1) continue;
    const key = `${edge.label}\0${edge.line}\0${dim}`;
    const g = groups.get(key);
    if (g) g.count++;
    else groups.set(key, { layer: edge.label, line: edge.line, dim, count: 1 });
  }
  return [...groups.values()].sort(
    (a, b) => a.line - b.line || (a.layer < b.layer ? -1 : a.layer > b.layer ? 1 : 0) || a.dim - b.dim
  );
}

// src/cut/probe/modular.ts
var PROBE_PRIME = 67108859;
var INVERSE = 1 / PROBE_PRIME;
function mulAddMod(a, b, c) {
  const x = a * b + c;
  const r = x - Math.floor(x * INVERSE) * PROBE_PRIME;
  return r < 0 ? r + PROBE_PRIME : r >= PROBE_PRIME ? r - PROBE_PRIME : r;
}
function inverseMod(a) {
  if (a === 0) throw new RangeError("0 has no inverse modulo the probe prime");
  let result = 1;
  let base = a;
  for (let e = PROBE_PRIME - 2; e > 0; e = Math.floor(e / 2)) {
    if (e % 2 === 1) result = mulAddMod(result, base, 0);
    base = mulAddMod(base, base, 0);
  }
  return result;
}
function certifyingMinor(m, rows, cols) {
  const origin = Array.from({ length: rows }, (_, i) => i);
  const pivotRows = [];
  const pivotCols = [];
  let det = 1;
  let rank = 0;
  for (let c = 0; c < cols && rank < rows; c++) {
    let pivot = rank;
    while (pivot < rows && m[pivot * cols + c] === 0) pivot++;
    if (pivot === rows) continue;
    if (pivot !== rank) {
      for (let k = c; k < cols; k++) {
        const t = m[pivot * cols + k];
        m[pivot * cols + k] = m[rank * cols + k];
        m[rank * cols + k] = t;
      }
      const o = origin[pivot];
      origin[pivot] = origin[rank];
      origin[rank] = o;
    }
    const head = m[rank * cols + c];
    det = mulAddMod(det, head, 0);
    const scale = inverseMod(head);
    for (let r = rank + 1; r < rows; r++) {
      const f2 = m[r * cols + c];
      if (f2 === 0) continue;
      const factor = PROBE_PRIME - mulAddMod(f2, scale, 0);
      const ro = r * cols;
      const po = rank * cols;
      for (let k = c; k < cols; k++) {
        const x = factor * m[po + k] + m[ro + k];
        const y = x - Math.floor(x * INVERSE) * PROBE_PRIME;
        m[ro + k] = y < 0 ? y + PROBE_PRIME : y >= PROBE_PRIME ? y - PROBE_PRIME : y;
      }
    }
    pivotRows.push(origin[rank]);
    pivotCols.push(c);
    rank++;
  }
  let inversions = 0;
  for (let i = 0; i < pivotRows.length; i++) for (let j = i + 1; j < pivotRows.length; j++) if (pivotRows[i] > pivotRows[j]) inversions++;
  if (inversions % 2 === 1 && det !== 0) det = PROBE_PRIME - det;
  return { rows: [...pivotRows].sort((a, b) => a - b), cols: pivotCols, determinant: det };
}

// src/cut/probe/draw.ts
function fnv1a(name) {
  let h = 2166136261;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 16777619) >>> 0;
  return h;
}
function mix(x) {
  x = Math.imul(x ^ x >>> 16, 2246822507) >>> 0;
  x = Math.imul(x ^ x >>> 13, 3266489909) >>> 0;
  return (x ^ x >>> 16) >>> 0;
}
function drawValues(seed, name, length) {
  const base = mix((seed ^ fnv1a(name)) >>> 0);
  const out = new Float64Array(length);
  for (let i = 0; i < length; i++) out[i] = valueAt(base, i);
  return out;
}
function drawValue(seed, name, i) {
  return valueAt(mix((seed ^ fnv1a(name)) >>> 0), i);
}
function valueAt(base, i) {
  return mix(base + Math.imul(i + 1, 2654435769) >>> 0) % PROBE_PRIME;
}

// src/cut/probe/surrogate-program.ts
var mulAddMod2 = mulAddMod;
function applyMap(map, buf, vo, oo, accumulate) {
  const { w, r, d, g } = map;
  const dg = d / g;
  const rg = r / g;
  for (let k = 0; k < r; k++) {
    let acc = accumulate ? buf[oo + k] : 0;
    const from = vo + Math.floor(k / rg) * dg;
    const row2 = k * dg;
    for (let c = 0; c < dg; c++) acc = mulAddMod2(w[row2 + c], buf[from + c], acc);
    buf[oo + k] = acc;
  }
}
var ProgramBuilder = class {
  constructor(seed) {
    this.seed = seed;
  }
  seed;
  steps = [];
  size = 0;
  weights = /* @__PURE__ */ new Map();
  zeros = /* @__PURE__ */ new Map();
  add(length, reads, cost, make) {
    const offset = this.size;
    this.steps.push({ offset, length, reads, cost, run: make ? make(offset) : null });
    this.size += length;
    return this.steps.length - 1;
  }
  off(s) {
    return this.steps[s].offset;
  }
  len(s) {
    return this.steps[s].length;
  }
  weight(name, length) {
    let w = this.weights.get(name);
    if (!w) {
      w = drawValues(this.seed, name, length);
      this.weights.set(name, w);
    }
    return w;
  }
  map(name, r, d, g) {
    return { w: this.weight(name, r * (d / g)), r, d, g };
  }
  /** A vector that is zero for every weight (a window of padding only). */
  zeroVector(width) {
    let z = this.zeros.get(width);
    if (z === void 0) {
      z = this.add(width, [], 0, (oo) => (buf) => buf.fill(0, oo, oo + width));
      this.zeros.set(width, z);
    }
    return z;
  }
  /** Σ_i W_i v_i over (map, step) terms; the zero vector without terms. */
  mapSum(terms, r) {
    if (terms.length === 0) return this.zeroVector(r);
    const parts = terms.map((t) => ({ map: t.map, vo: this.off(t.src) }));
    const cost = terms.reduce((a, t) => a + t.map.r * (t.map.d / t.map.g), 0);
    return this.add(r, [...new Set(terms.map((t) => t.src))], cost, (oo) => (buf) => {
      parts.forEach((p, i) => applyMap(p.map, buf, p.vo, oo, i > 0));
    });
  }
  /** The elementwise product of the vectors (one vector: itself). */
  product(srcs, width) {
    if (srcs.length === 1) return srcs[0];
    const offs = srcs.map((s) => this.off(s));
    return this.add(width, [...new Set(srcs)], width * (srcs.length - 1), (oo) => (buf) => {
      for (let k = 0; k < width; k++) {
        let acc = buf[offs[0] + k];
        for (let i = 1; i < offs.length; i++) acc = mulAddMod2(acc, buf[offs[i] + k], 0);
        buf[oo + k] = acc;
      }
    });
  }
  /** Σ_i c_i v_i with fixed coefficients (residues). */
  combination(srcs, coefficients, width) {
    if (srcs.length === 1 && coefficients[0] === 1) return srcs[0];
    const offs = srcs.map((s) => this.off(s));
    return this.add(width, [...new Set(srcs)], width * srcs.length, (oo) => (buf) => {
      for (let k = 0; k < width; k++) {
        let acc = 0;
        for (let i = 0; i < offs.length; i++) acc = mulAddMod2(coefficients[i], buf[offs[i] + k], acc);
        buf[oo + k] = acc;
      }
    });
  }
  concat(srcs) {
    if (srcs.length === 1) return srcs[0];
    const parts = srcs.map((s) => ({ off: this.off(s), len: this.len(s) }));
    const total = parts.reduce((a, p) => a + p.len, 0);
    return this.add(total, [...new Set(srcs)], total, (oo) => (buf) => {
      let o = oo;
      for (const p of parts) {
        buf.copyWithin(o, p.off, p.off + p.len);
        o += p.len;
      }
    });
  }
};
function flat(at, shape) {
  return shape.length === 1 ? at[0] : at[0] * shape[1] + at[1];
}
function eachIndex(shape) {
  if (shape.length === 1) return Array.from({ length: shape[0] }, (_, j) => [j]);
  const out = [];
  for (let i = 0; i < shape[0]; i++) for (let j = 0; j < shape[1]; j++) out.push([i, j]);
  return out;
}
function product2(lists) {
  if (lists.length === 1) return lists[0].map((x) => [x]);
  const out = [];
  for (const a of lists[0]) for (const b of lists[1]) out.push([a, b]);
  return out;
}
function surrogateProgram(model, shapes, reading, surrogate, seed) {
  const b = new ProgramBuilder(seed);
  const m = shapes.representation;
  const n = positionCount(model.input.shape);
  const input = { shape: model.input.shape, width: m, steps: Array.from({ length: n }, () => b.add(m, [], 0, null)) };
  const grids = [];
  const gridOf = (i) => i === INPUT ? input : grids[i];
  for (const layer of model.layers) {
    const src = gridOf(layer.inputs[0]);
    const out = shapes.layers[layer.index];
    const groups = shapes.groups[layer.index];
    const i = layer.index;
    let grid;
    switch (layer.kind) {
      case "pointwise":
        grid = reading.squared.has(i) ? { ...src, steps: src.steps.map((s) => b.product([s, s], src.width)) } : src;
        break;
      case "flatten":
        grid = { shape: out.shape, width: src.width * src.steps.length, steps: [b.concat(src.steps)] };
        break;
      case "dense": {
        const u = layer.units;
        if (shapes.denseReading[i] === "per-position") {
          const steps = src.steps.map((s, p) => b.mapSum([{ map: b.map(model.weightSharing ? `L${i}` : `L${i}@${p}`, u, src.width, 1), src: s }], u));
          grid = { shape: out.shape, width: u, steps };
        } else {
          const whole = b.concat(src.steps);
          grid = { shape: out.shape, width: u, steps: [b.mapSum([{ map: b.map(`L${i}`, u, b.len(whole), 1), src: whole }], u)] };
        }
        break;
      }
      case "embedding": {
        const steps = src.steps.map((s) => b.mapSum([{ map: b.map(`L${i}`, layer.dim, src.width, 1), src: s }], layer.dim));
        grid = { shape: out.shape, width: layer.dim, steps };
        break;
      }
      case "merge": {
        const ins = layer.inputs.map(gridOf);
        const steps = src.steps.map((_, p) => {
          const at = ins.map((g) => g.steps[p]);
          return layer.mode === "sum" ? b.combination(at, at.map(() => 1), out.width) : b.concat(at);
        });
        grid = { shape: out.shape, width: out.width, steps };
        break;
      }
      case "recurrent":
        grid = recurrent2(b, src, layer);
        break;
      case "position": {
        if (layer.mode !== "learned") return void 0;
        const w = src.width;
        const steps = src.steps.map((s, p) => {
          const pv = b.weight(`L${i}@${p}`, w);
          const so = b.off(s);
          return b.add(w, [s], w, (oo) => (buf) => {
            for (let k = 0; k < w; k++) buf[oo + k] = (buf[so + k] + pv[k]) % PROBE_PRIME;
          });
        });
        grid = { shape: out.shape, width: w, steps };
        break;
      }
      case "class-token": {
        const cv = b.weight(`L${i}`, src.width);
        const token = b.add(src.width, [], 0, (oo) => (buf) => buf.set(cv, oo));
        grid = { shape: out.shape, width: src.width, steps: [token, ...src.steps] };
        break;
      }
      case "attention":
        grid = attention2(b, src, layer, shapes.headDims[i]);
        break;
      case "pool":
        grid = pool2(b, src, layer, out.shape);
        break;
      case "upsample":
        if (layer.mode === "linear" && layer.factor.some((f2) => 2 * f2 % PROBE_PRIME === 0)) return void 0;
        grid = upsample2(b, src, layer, out.shape);
        break;
      case "conv":
        grid = surrogate === "tree" ? treeConv(b, src, layer, out.shape, out.width, groups, model.weightSharing) : overlapConv(b, src, layer, out.shape, out.width, groups, model.weightSharing);
        break;
      case "conv-transpose":
        grid = convTranspose2(b, src, layer, out.shape, groups, model.weightSharing, surrogate);
        break;
      default:
        return void 0;
    }
    if (!grid || grid.steps.length !== positionCount(out.shape) || grid.width !== out.width) return void 0;
    grids.push(grid);
  }
  const last = grids[grids.length - 1];
  const top = last.steps[flat(shapes.output.position, last.shape)];
  const head = b.weight("head", last.width);
  const to = b.off(top);
  const width = last.width;
  const output = b.add(1, [top], width, (oo) => (buf) => {
    let acc = 0;
    for (let k = 0; k < width; k++) acc = mulAddMod2(head[k], buf[to + k], acc);
    buf[oo] = acc;
  });
  return { steps: b.steps, bufferSize: b.size, positions: n, m, tokens: model.input.vocabulary !== void 0, output };
}
function chain(b, names, hidden, xs, width, order) {
  const wh = b.map(names.h, hidden, hidden, 1);
  const wi = b.map(names.i, hidden, width, 1);
  const h0 = b.weight(names.h0, hidden);
  let state = b.add(hidden, [], 0, (oo) => (buf) => buf.set(h0, oo));
  const states = new Array(xs.length);
  for (const t of order) {
    state = b.product([b.mapSum([{ map: wh, src: state }], hidden), b.mapSum([{ map: wi, src: xs[t] }], hidden)], hidden);
    states[t] = state;
  }
  return states;
}
function recurrent2(b, src, layer) {
  const { index: i, hidden, depth } = layer;
  const T = src.steps.length;
  const forward = Array.from({ length: T }, (_, t) => t);
  const backward = forward.slice().reverse();
  const join3 = (f2, g) => layer.merge === "concat" ? b.concat([f2, g]) : b.combination([f2, g], [1, 1], hidden);
  let below = src.steps;
  let width = src.width;
  let last = [];
  for (let l = 1; l <= depth; l++) {
    const f2 = chain(b, { h: `L${i}:H${l}`, i: `L${i}:I${l}`, h0: `L${i}:h0_${l}` }, hidden, below, width, forward);
    if (!layer.bidirectional) {
      below = f2;
      width = hidden;
      last = [f2[T - 1]];
      continue;
    }
    const g = chain(b, { h: `L${i}:UH${l}`, i: `L${i}:UI${l}`, h0: `L${i}:b0_${l}` }, hidden, below, width, backward);
    below = f2.map((ft, t) => join3(ft, g[t]));
    width = layer.merge === "concat" ? 2 * hidden : hidden;
    last = [f2[T - 1], g[0]];
  }
  if (layer.sequence) return { shape: src.shape, width, steps: below };
  return { shape: [1], width, steps: [last.length === 1 ? last[0] : join3(last[0], last[1])] };
}
function attention2(b, src, layer, a) {
  const n = src.steps.length;
  const D = src.width;
  const H = layer.heads;
  if (a <= 0 || layer.window !== void 0 && src.shape.length !== 1) return void 0;
  const i = layer.index;
  const heads = Array.from({ length: H }, (_, h) => ({
    q: b.weight(`L${i}:Q${h}`, a * D),
    k: b.weight(`L${i}:K${h}`, a * D),
    v: b.weight(`L${i}:V${h}`, a * D),
    o: b.weight(`L${i}:O${h}`, D * a)
  }));
  const block2 = a * a;
  const kvWidth = H * block2;
  const rowDot = (w, r, buf, vo) => {
    let acc = 0;
    for (let c = 0; c < D; c++) acc = mulAddMod2(w[r * D + c], buf[vo + c], acc);
    return acc;
  };
  const queries = src.steps.map((s) => {
    const vo = b.off(s);
    return b.add(H * a, [s], H * a * D, (oo) => (buf) => {
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) buf[oo + h * a + r] = rowDot(hd.q, r, buf, vo);
      });
    });
  });
  const blocks = src.steps.map((s) => {
    const vo = b.off(s);
    const kk = new Float64Array(a);
    const vv = new Float64Array(a);
    return b.add(kvWidth, [s], H * (2 * a * D + block2), (oo) => (buf) => {
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) {
          kk[r] = rowDot(hd.k, r, buf, vo);
          vv[r] = rowDot(hd.v, r, buf, vo);
        }
        for (let r = 0; r < a; r++) for (let c = 0; c < a; c++) buf[oo + h * block2 + r * a + c] = mulAddMod2(vv[r], kk[c], 0);
      });
    });
  });
  const nodes = /* @__PURE__ */ new Map();
  const node = (lo, hi) => {
    if (hi - lo === 1) return blocks[lo];
    const key = `${lo}:${hi}`;
    let s = nodes.get(key);
    if (s === void 0) {
      const mid = lo + hi >> 1;
      s = b.combination([node(lo, mid), node(mid, hi)], [1, 1], kvWidth);
      nodes.set(key, s);
    }
    return s;
  };
  const cover = (from, to, lo, hi, into) => {
    if (to <= lo || hi <= from) return;
    if (from <= lo && hi <= to) {
      into.push(node(lo, hi));
      return;
    }
    const mid = lo + hi >> 1;
    cover(from, to, lo, mid, into);
    cover(from, to, mid, hi, into);
  };
  const fields = /* @__PURE__ */ new Map();
  const steps = src.steps.map((_, t) => {
    let lo = 0;
    let hi = n - 1;
    if (layer.causal) hi = t;
    if (layer.window !== void 0) {
      lo = Math.max(lo, t - layer.window);
      hi = Math.min(hi, t + layer.window);
    }
    const key = `${lo}:${hi}`;
    let field = fields.get(key);
    if (field === void 0) {
      const parts = [];
      cover(lo, hi + 1, 0, n, parts);
      field = b.combination(parts, parts.map(() => 1), kvWidth);
      fields.set(key, field);
    }
    const so = b.off(field);
    const qo = b.off(queries[t]);
    const sq = new Float64Array(a);
    return b.add(D, [field, queries[t]], H * (block2 + D * a), (oo) => (buf) => {
      buf.fill(0, oo, oo + D);
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) {
          let acc = 0;
          for (let c = 0; c < a; c++) acc = mulAddMod2(buf[so + h * block2 + r * a + c], buf[qo + h * a + c], acc);
          sq[r] = acc;
        }
        for (let k = 0; k < D; k++) {
          let acc = buf[oo + k];
          for (let r = 0; r < a; r++) acc = mulAddMod2(hd.o[k * a + r], sq[r], acc);
          buf[oo + k] = acc;
        }
      });
    });
  });
  return { shape: src.shape, width: D, steps };
}
function axisPlans(src, k, s, d, layer) {
  const plans3 = src.shape.map((n, a) => windowAxis(n, k[a], s[a], d[a], layer.padding, a));
  return plans3.every((p) => typeof p !== "string") ? plans3 : void 0;
}
function pool2(b, src, layer, shape) {
  if (layer.global) return { shape, width: src.width, steps: [b.product(src.steps, src.width)] };
  const plans3 = axisPlans(src, layer.window, layer.stride, layer.window.map(() => 1), layer);
  if (!plans3) return void 0;
  const steps = [];
  for (const j of eachIndex(shape)) {
    const lists = j.map((jj, a) => windowTaps(jj, src.shape[a], layer.window[a], layer.stride[a], 1, plans3[a].left));
    const at = product2(lists).map((p) => src.steps[flat(p, src.shape)]);
    if (at.length === 0) return void 0;
    steps.push(b.product(at, src.width));
  }
  return { shape, width: src.width, steps };
}
function upsample2(b, src, layer, shape) {
  const steps = eachIndex(shape).map((j) => {
    if (layer.mode === "nearest") return src.steps[flat(j.map((jj, a) => Math.floor(jj / layer.factor[a])), src.shape)];
    const perAxis2 = j.map((jj, a) => {
      const s = linearSources(jj, src.shape[a], layer.factor[a]);
      const lambda = mulAddMod2(s.num, inverseMod(s.den), 0);
      return [
        { i: s.i0, w: (1 - lambda + PROBE_PRIME) % PROBE_PRIME },
        { i: s.i1, w: lambda }
      ];
    });
    const bySource = /* @__PURE__ */ new Map();
    for (const combo of product2(perAxis2)) {
      const step = src.steps[flat(combo.map((t) => t.i), src.shape)];
      const w = combo.reduce((acc, t) => mulAddMod2(acc, t.w, 0), 1);
      bySource.set(step, ((bySource.get(step) ?? 0) + w) % PROBE_PRIME);
    }
    const terms = [...bySource].filter(([, w]) => w !== 0);
    return b.combination(terms.map(([s]) => s), terms.map(([, w]) => w), src.width);
  });
  return { shape, width: src.width, steps };
}
function treeConv(b, src, layer, shape, r, g, shared) {
  const plans3 = axisPlans(src, layer.kernel, layer.stride, layer.dilation, layer);
  if (!plans3) return void 0;
  const causal = layer.padding.mode === "causal";
  const mapped = /* @__PURE__ */ new Map();
  const mapAt = (p) => {
    let s = mapped.get(p);
    if (s === void 0) {
      s = b.mapSum([{ map: b.map(shared ? `L${layer.index}` : `L${layer.index}@${p}`, r, src.width, g), src: src.steps[p] }], r);
      mapped.set(p, s);
    }
    return s;
  };
  const steps = eachIndex(shape).map((j) => {
    const lists = j.map((jj, a) => treeConvPositions(jj, src.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], plans3[a], causal));
    const at = product2(lists).map((p) => flat(p, src.shape));
    return at.length === 0 ? b.zeroVector(r) : b.product(at.map(mapAt), r);
  });
  return { shape, width: r, steps };
}
function overlapConv(b, src, layer, shape, r, g, shared) {
  const plans3 = axisPlans(src, layer.kernel, layer.stride, layer.dilation, layer);
  if (!plans3) return void 0;
  const steps = eachIndex(shape).map((j, o) => {
    const perAxis2 = j.map((jj, a) => {
      const args = [jj, src.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], plans3[a].left];
      const at = windowTaps(...args);
      const taps = windowTapIndices(...args);
      return at.map((p, x) => ({ p, t: taps[x] }));
    });
    const terms = product2(perAxis2).map((pair) => {
      const t = flat(pair.map((x) => x.t), layer.kernel);
      const name = shared ? `L${layer.index}t${t}` : `L${layer.index}@${o}t${t}`;
      return { map: b.map(name, r, src.width, g), src: src.steps[flat(pair.map((x) => x.p), src.shape)] };
    });
    return b.mapSum(terms, r);
  });
  return { shape, width: r, steps };
}
function convTranspose2(b, src, layer, shape, g, shared, surrogate) {
  const r = layer.channels;
  const steps = eachIndex(shape).map((j, o) => {
    if (surrogate === "tree") {
      const per = j.map((jj, a) => treeTransposeSource(jj, src.shape[a], layer.stride[a]));
      const u = flat(per.map((x) => x[1]), layer.stride);
      const name = shared ? `L${layer.index}o${u}` : `L${layer.index}@${o}`;
      return b.mapSum([{ map: b.map(name, r, src.width, g), src: src.steps[flat(per.map((x) => x[0]), src.shape)] }], r);
    }
    const perAxis2 = j.map((jj, a) => transposeSources(jj, src.shape[a], layer.kernel[a], layer.stride[a], layer.dilation[a], layer.padding[a]));
    const terms = product2(perAxis2).map((pairs) => {
      const t = flat(pairs.map((x) => x[1]), layer.kernel);
      const name = shared ? `L${layer.index}t${t}` : `L${layer.index}@${o}t${t}`;
      return { map: b.map(name, r, src.width, g), src: src.steps[flat(pairs.map((x) => x[0]), src.shape)] };
    });
    return b.mapSum(terms, r);
  });
  return { shape, width: r, steps };
}

// src/cut/probe/certified-probe.ts
var PROBE_METHOD = "certified probe";
var PROBE_BUDGET = 1e7;
var PROBE_SEED = 1;
var PROBE_SCHEME = 2;
var MAX_PROBES = 1024;
var FIRST_PROBES = 8;
var MAX_BUFFER = 4e6;
function certifiedProbe(model, shapes, reading, surrogate, budget = PROBE_BUDGET) {
  if (budget <= 0) return void 0;
  const estimate = estimateCost(model, shapes, surrogate);
  if (estimate.cost * 2 * FIRST_PROBES > budget || estimate.buffer > MAX_BUFFER) return void 0;
  let program = null;
  return (side, lower, upper) => {
    if (program === null) program = surrogateProgram(model, shapes, reading, surrogate, PROBE_SEED);
    if (!program) return void 0;
    const limit = upper < BigInt(MAX_PROBES) ? Number(upper) : MAX_PROBES;
    if (BigInt(limit) <= lower) return void 0;
    const found = probeRank(program, side, lower, limit, budget);
    if (!found || BigInt(found.minor.rows.length) <= lower) return void 0;
    const rank = BigInt(found.minor.rows.length);
    const certificate = {
      scheme: PROBE_SCHEME,
      prime: PROBE_PRIME,
      seed: PROBE_SEED,
      probes: found.probes,
      rows: found.minor.rows,
      cols: found.minor.cols,
      determinant: found.minor.determinant
    };
    return { rank, log2: log2Big(rank), method: PROBE_METHOD, cut: [], certificate };
  };
}
function probeInputName(side, index, position) {
  return `${side}${index}@${position}`;
}
var CONSTANT = 0;
var SIDE_A = 1;
var SIDE_B = 2;
var MIXED = 3;
function probeRank(program, side, lower, most, budget) {
  let limit = most;
  const { steps, positions, m } = program;
  const cls = new Uint8Array(steps.length);
  for (let s = 0; s < steps.length; s++) {
    if (s < positions) cls[s] = side[s] === 1 ? SIDE_A : SIDE_B;
    else {
      let c = CONSTANT;
      for (const r of steps[s].reads) c |= cls[r];
      cls[s] = c;
    }
  }
  if (cls[program.output] !== MIXED) return void 0;
  const lists = [[], [], [], []];
  const cost = [0, 0, 0, 0];
  for (let s = positions; s < steps.length; s++) {
    lists[cls[s]].push(s);
    cost[cls[s]] += steps[s].cost + 1;
  }
  const frontier = [[], [], [], []];
  const seen = new Uint8Array(steps.length);
  for (const s of lists[MIXED]) {
    for (const r of steps[s].reads) {
      if (cls[r] !== MIXED && cls[r] !== CONSTANT && !seen[r]) {
        seen[r] = 1;
        frontier[cls[r]].push(r);
      }
    }
  }
  const spans2 = frontier.map((list2) => Int32Array.from(list2.flatMap((s) => [steps[s].offset, steps[s].length])));
  const width = (which) => frontier[which].reduce((a, s) => a + steps[s].length, 0);
  const frontierA = width(SIDE_A);
  const frontierB = width(SIDE_B);
  const rowCost = cost[SIDE_A] + frontierA + m * positions;
  const colCost = cost[SIDE_B] + frontierB + m * positions;
  const entryCost = cost[MIXED] + frontierB;
  const buf = new Float64Array(program.bufferSize);
  const runAll = (list2) => {
    for (const s of list2) steps[s].run(buf);
  };
  runAll(lists[CONSTANT]);
  const sideOf = (which) => {
    const at = [];
    for (let p = 0; p < positions; p++) if (cls[p] === which) at.push(p);
    return at;
  };
  const positionsA = sideOf(SIDE_A);
  const positionsB = sideOf(SIDE_B);
  const known = Number(lower < BigInt(MAX_PROBES) ? lower : BigInt(MAX_PROBES));
  if (program.tokens) limit = Math.min(limit, m ** positionsA.length, m ** positionsB.length);
  if (limit <= known) return void 0;
  const usedTokens = { [SIDE_A]: /* @__PURE__ */ new Set(), [SIDE_B]: /* @__PURE__ */ new Set() };
  const sideValues = (which, index) => {
    const name = which === SIDE_A ? "a" : "b";
    const inputs = which === SIDE_A ? positionsA : positionsB;
    if (!program.tokens) {
      for (const p of inputs) buf.set(drawValues(PROBE_SEED, probeInputName(name, index, p), m), steps[p].offset);
    } else {
      const tokens = distinctTokens(inputs.map((p) => probeInputName(name, index, p)), m, usedTokens[which]);
      inputs.forEach((p, k2) => {
        const o = steps[p].offset;
        buf.fill(0, o, o + m);
        buf[o + tokens[k2]] = 1;
      });
    }
    runAll(lists[which]);
    const saved = new Float64Array(which === SIDE_A ? frontierA : frontierB);
    const at = spans2[which];
    for (let x = 0, o = 0; x < at.length; x += 2) for (let k2 = 0; k2 < at[x + 1]; k2++) saved[o++] = buf[at[x] + k2];
    return saved;
  };
  const restore = (which, saved) => {
    const at = spans2[which];
    for (let x = 0, o = 0; x < at.length; x += 2) for (let k2 = 0; k2 < at[x + 1]; k2++) buf[at[x] + k2] = saved[o++];
  };
  const mixed = lists[MIXED];
  const out = steps[program.output].offset;
  const rows = [];
  const cols = [];
  const entries2 = [];
  let spent = 0;
  let best;
  let k = Math.min(limit, Math.max(FIRST_PROBES, nextPowerOfTwo(known + 1)));
  const stepCost = (from, to) => (to - from) * (rowCost + colCost) + (to * to - from * from) * entryCost + to * to * to / 3;
  for (; ; ) {
    const before = rows.length;
    if (spent + stepCost(before, k) > budget) {
      let lo = before;
      let hi = k;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (spent + stepCost(before, mid) <= budget) lo = mid;
        else hi = mid;
      }
      if (lo <= Math.max(before, known, best?.minor.rows.length ?? 0)) break;
      k = lo;
      limit = k;
    }
    spent += stepCost(before, k);
    while (cols.length < k) cols.push(sideValues(SIDE_B, cols.length));
    while (rows.length < k) {
      rows.push(sideValues(SIDE_A, rows.length));
      entries2.push(new Float64Array(limit));
    }
    for (let i = 0; i < k; i++) {
      restore(SIDE_A, rows[i]);
      for (let j = i < before ? before : 0; j < k; j++) {
        restore(SIDE_B, cols[j]);
        runAll(mixed);
        entries2[i][j] = buf[out];
      }
    }
    const matrix = new Float64Array(k * k);
    for (let i = 0; i < k; i++) matrix.set(entries2[i].subarray(0, k), i * k);
    const minor = certifyingMinor(matrix, k, k);
    if (!best || minor.rows.length > best.minor.rows.length) best = { probes: k, minor };
    if (minor.rows.length < k || k >= limit) break;
    k = Math.min(limit, 2 * k);
  }
  return best;
}
function distinctTokens(names, vocabulary, used) {
  for (let t = 0; ; t++) {
    const tokens = names.map((n) => drawValue(PROBE_SEED, n, t) % vocabulary);
    const key = tokens.join(",");
    if (!used.has(key)) {
      used.add(key);
      return tokens;
    }
  }
}
function nextPowerOfTwo(x) {
  let p = 1;
  while (p < x) p *= 2;
  return p;
}
function estimateCost(model, shapes, surrogate) {
  const m = shapes.representation;
  let cost = 0;
  let buffer = positionCount(model.input.shape) * m;
  for (const layer of model.layers) {
    const src = layer.inputs[0] < 0 ? { shape: model.input.shape, width: m } : shapes.layers[layer.inputs[0]];
    const out = shapes.layers[layer.index];
    const pin = positionCount(src.shape);
    const pout = positionCount(out.shape);
    const d = src.width;
    const r = out.width;
    const g = shapes.groups[layer.index];
    const taps = (k) => k.reduce((a, x) => a * x, 1);
    let c;
    switch (layer.kind) {
      case "pointwise":
        c = pout * r;
        break;
      case "flatten":
        c = pin * d;
        break;
      case "dense":
        c = shapes.denseReading[layer.index] === "per-position" ? pout * r * d : r * d * pin + d * pin;
        break;
      case "merge":
        c = pout * r * layer.inputs.length;
        break;
      case "embedding":
        c = pout * r * d;
        break;
      case "recurrent": {
        const dirs = layer.bidirectional ? 2 : 1;
        c = pin * layer.depth * dirs * (layer.hidden * (layer.hidden + Math.max(d, dirs * layer.hidden) + 2));
        break;
      }
      case "position":
        c = pout * r;
        break;
      case "class-token":
        c = r;
        break;
      case "attention": {
        const a = shapes.headDims[layer.index];
        const blockWidth = layer.heads * a * a;
        const sums = pin * (Math.ceil(Math.log2(Math.max(pin, 2))) + 4) * blockWidth;
        c = pin * layer.heads * (3 * a * d + a * a) + sums + pout * layer.heads * (a * a + r * a);
        buffer += pin * layer.heads * a + sums;
        break;
      }
      case "pool":
        c = layer.global ? pin * d : pout * taps(layer.window) * d;
        break;
      case "upsample":
        c = pout * 4 * d;
        break;
      case "conv":
        c = surrogate === "overlap" ? pout * taps(layer.kernel) * r * (d / g) : pin * r * (d / g) + pout * taps(layer.stride) * r;
        break;
      case "conv-transpose":
        c = pout * taps(layer.kernel) * r * (d / g);
        break;
      default:
        return { cost: Infinity, buffer: Infinity };
    }
    cost += c;
    buffer += layer.kind === "recurrent" ? pin * layer.depth * (layer.bidirectional ? 2 : 1) * layer.hidden * 4 : (pout + pin) * r;
  }
  return { cost, buffer };
}

// src/cut/probe/explicit-probe.ts
var MAX_FACTOR = 1 << 22;
function explicitTensorName(name) {
  return `tensor:${name}`;
}
function sizeOf(vars, dims) {
  let s = 1;
  for (const v of vars) s *= dims[v];
  return s;
}
function productSum(fs, keep, sum, dims) {
  const all = sum === null ? keep : [...keep, sum];
  const size = sizeOf(keep, dims);
  const out = new Float64Array(size);
  const at = new Int32Array(dims.length);
  const strides = fs.map((f2) => {
    const s = new Float64Array(all.length);
    let stride = 1;
    for (let k = f2.vars.length - 1; k >= 0; k--) {
      const v = f2.vars[k];
      s[all.indexOf(v)] = stride;
      stride *= dims[v];
    }
    return s;
  });
  const total = sizeOf(all, dims);
  const inner = sum === null ? 1 : dims[sum];
  for (let flat2 = 0; flat2 < total; flat2++) {
    let rest = flat2;
    for (let k = all.length - 1; k >= 0; k--) {
      const d = dims[all[k]];
      at[k] = rest % d;
      rest = Math.floor(rest / d);
    }
    let value = 1;
    for (let i = 0; i < fs.length; i++) {
      let o = 0;
      const s = strides[i];
      for (let k = 0; k < all.length; k++) o += s[k] * at[k];
      value = mulAddMod(value, fs[i].data[o], 0);
    }
    const target = Math.floor(flat2 / inner);
    out[target] = (out[target] + value) % PROBE_PRIME;
  }
  return { vars: keep, data: out };
}
function planElimination(factorVars, bonds, dims) {
  let groups = factorVars.map((v) => new Set(v));
  const left = new Set(bonds);
  const order = [];
  let cost = 0;
  while (left.size > 0) {
    let best;
    for (const v of left) {
      const union = /* @__PURE__ */ new Set();
      let count = 0;
      for (const g of groups) {
        if (!g.has(v)) continue;
        count++;
        for (const x of g) union.add(x);
      }
      const work = sizeOf(union, dims) * Math.max(count, 1);
      union.delete(v);
      const size = sizeOf(union, dims);
      if (!best || size < best.size || size === best.size && work < best.work) best = { v, size, work };
    }
    if (best.size > MAX_FACTOR) return void 0;
    cost += best.work;
    order.push(best.v);
    left.delete(best.v);
    const merged = /* @__PURE__ */ new Set();
    const kept = [];
    for (const g of groups) {
      if (g.has(best.v)) for (const x of g) merged.add(x);
      else kept.push(g);
    }
    merged.delete(best.v);
    groups = [...kept, merged];
  }
  return { order, cost };
}
function explicitProbe(model, side, lower, budget = PROBE_BUDGET) {
  if (budget <= 0) return void 0;
  const dims = [];
  const fresh = (d) => {
    dims.push(d);
    return dims.length - 1;
  };
  const bondVars = model.bonds.map((b) => fresh(b.dim));
  const rows = [];
  const cols = [];
  const tensorVars = [];
  for (const t of model.tensors) {
    const vars = [];
    for (const leg of t.legs) {
      const v = fresh(leg.dim);
      vars.push(v);
      (side[leg.position] === 1 ? rows : cols).push(v);
    }
    for (let i = 0; i < model.bonds.length; i++) {
      const times = model.bonds[i].tensors.filter((n) => n === t.name).length;
      if (times > 1) return void 0;
      if (times === 1) vars.push(bondVars[i]);
    }
    tensorVars.push(vars);
  }
  const r = sizeOf(rows, dims);
  const c = sizeOf(cols, dims);
  if (rows.length === 0 || cols.length === 0 || r * c > MAX_FACTOR) return void 0;
  if (BigInt(Math.min(r, c)) <= lower) return void 0;
  const plan = planElimination(tensorVars, bondVars, dims);
  if (!plan) return void 0;
  const elimination = r * c * Math.min(r, c) / 3;
  if (plan.cost + r * c * model.tensors.length + elimination > budget) return void 0;
  let factors = model.tensors.map((t, i) => ({ vars: tensorVars[i], data: drawValues(PROBE_SEED, explicitTensorName(t.name), sizeOf(tensorVars[i], dims)) }));
  for (const v of plan.order) {
    const touching = factors.filter((f2) => f2.vars.includes(v));
    if (touching.length === 0) continue;
    const keep = [...new Set(touching.flatMap((f2) => f2.vars))].filter((x) => x !== v);
    factors = [...factors.filter((f2) => !f2.vars.includes(v)), productSum(touching, keep, v, dims)];
  }
  const matrix = productSum(factors, [...rows, ...cols], null, dims).data;
  const minor = certifyingMinor(matrix, r, c);
  const rank = BigInt(minor.rows.length);
  if (rank <= lower) return void 0;
  const certificate = {
    scheme: PROBE_SCHEME,
    prime: PROBE_PRIME,
    seed: PROBE_SEED,
    matricisation: [r, c],
    rows: minor.rows,
    cols: minor.cols,
    determinant: minor.determinant
  };
  return { rank, log2: log2Big(rank), method: PROBE_METHOD, cut: [], certificate };
}

// src/cut/top-window-lower.ts
function topWindowLower(c, side) {
  let top = c.top;
  while (c.op[top] === OP_LINEAR) top = c.childList[c.childStart[top]];
  if (c.op[top] !== OP_PRODUCT) return void 0;
  const children = Array.from(c.childList.subarray(c.childStart[top], c.childStart[top + 1]));
  if (children.length < 2 || !sameKind(c, children)) return void 0;
  const dep = dependence(c, side);
  let a = 0;
  let b = 0;
  for (const ch of children) {
    if (dep[ch] === 1) a++;
    else if (dep[ch] === 2) b++;
  }
  if (a === 0 || b === 0) return void 0;
  const span = spans(c);
  const child = children[0];
  const d = BigInt(c.dim[top]);
  const rho = (count) => powerSpan2(c, child, span[child], count);
  const bound = rho(a) + rho(b) - d;
  return bound > 1n ? bound : 1n;
}
function powerSpan2(c, child, s, count) {
  const d = BigInt(c.dim[child]);
  if (c.op[child] !== OP_LINEAR) return BigInt(s) < d ? BigInt(s) : d;
  return powerSpan(s, count, d);
}
function sameKind(c, nodes) {
  const first = nodes[0];
  return nodes.every((v) => c.op[v] === c.op[first] && c.tag[v] === c.tag[first] && c.dim[v] === c.dim[first]);
}
function dependence(c, side) {
  const dep = new Uint8Array(c.size);
  for (let v = 0; v < c.size; v++) {
    if (c.op[v] === OP_INPUT) dep[v] = side[c.position[v]] === 1 ? 1 : 2;
    else for (let i = c.childStart[v]; i < c.childStart[v + 1]; i++) dep[v] = dep[v] | dep[c.childList[i]];
  }
  return dep;
}
function spans(c) {
  const s = new Float64Array(c.size);
  for (let v = 0; v < c.size; v++) {
    const first = c.childList[c.childStart[v]];
    switch (c.op[v]) {
      case OP_INPUT:
        s[v] = c.dim[v];
        break;
      case OP_CONST:
        s[v] = 1;
        break;
      case OP_LINEAR:
        s[v] = Math.min(c.dim[v], s[first]);
        break;
      case OP_PRODUCT: {
        const kids = Array.from(c.childList.subarray(c.childStart[v], c.childStart[v + 1]));
        const w = kids.length;
        if (w > 1 && sameKind(c, kids) && c.op[first] === OP_LINEAR) {
          s[v] = Number(powerSpan(s[first], w, BigInt(c.dim[v])));
        } else {
          s[v] = Math.min(c.dim[v], Math.max(...kids.map((k) => s[k])));
        }
        break;
      }
      default:
        s[v] = 1;
    }
  }
  return s;
}

// src/cut/window-product-lower.ts
var LEAF = 1;
var WINDOW = 2;
var CARRIER = 3;
function splitWindowLower(c, side) {
  const n = c.size;
  const kind = new Uint8Array(n);
  const span = new Int32Array(n);
  const inA = new Int32Array(n);
  const inB = new Int32Array(n);
  const rank = new Array(n);
  const windowRank = (v) => {
    const r = BigInt(c.dim[v]);
    const a = inA[v];
    const b = inB[v];
    if (a === 0 || b === 0) return 1n;
    const bound = sylvesterPowerSpan(span[v], a, b, r);
    return bound > 1n ? bound : 1n;
  };
  for (let v = 0; v < n; v++) {
    const from = c.childStart[v];
    const to = c.childStart[v + 1];
    switch (c.op[v]) {
      case OP_INPUT:
        kind[v] = LEAF;
        span[v] = c.dim[v];
        if (side[c.position[v]] === 1) inA[v] = 1;
        else inB[v] = 1;
        break;
      case OP_LINEAR: {
        const ch = c.childList[from];
        if (kind[ch] === LEAF) {
          kind[v] = LEAF;
          span[v] = Math.min(span[ch], c.dim[v]);
          inA[v] = inA[ch];
          inB[v] = inB[ch];
        } else if (kind[ch] === WINDOW) {
          kind[v] = CARRIER;
          rank[v] = windowRank(ch);
        } else if (kind[ch] === CARRIER) {
          kind[v] = CARRIER;
          rank[v] = rank[ch];
        } else return void 0;
        break;
      }
      case OP_PRODUCT: {
        const first = c.childList[from];
        const k = kind[first];
        if (k === CARRIER) {
          let r = 1n;
          for (let i = from; i < to; i++) {
            const ch = c.childList[i];
            if (kind[ch] !== CARRIER) return void 0;
            r *= rank[ch];
          }
          kind[v] = CARRIER;
          rank[v] = r;
        } else if (k === LEAF || k === WINDOW) {
          kind[v] = WINDOW;
          span[v] = span[first];
          for (let i = from; i < to; i++) {
            const ch = c.childList[i];
            if (kind[ch] !== LEAF && kind[ch] !== WINDOW || c.tag[ch] !== c.tag[first] || c.dim[ch] !== c.dim[first] || span[ch] !== span[first]) return void 0;
            inA[v] = inA[v] + inA[ch];
            inB[v] = inB[v] + inB[ch];
          }
        } else return void 0;
        break;
      }
      default:
        return void 0;
    }
  }
  const top = c.top;
  if (kind[top] === WINDOW) return windowRank(top);
  return kind[top] === CARRIER ? rank[top] : void 0;
}

// src/cut/additive-parts.ts
var PARTS_FROM_CHILDREN = 0;
var PARTS_TRIVIAL = 1;
var PARTS_FOLDED = 2;
var PARTS_EXPANDED = 3;
var MAX_TERMS = 2 ** 40;
var MAX_LISTED_TERMS = 4096;
var A2 = 1;
var B2 = 2;
var EXPANDED = 0;
var NOT_SEPARABLE = 1;
var OVER = 2;
var AdditiveParts = class {
  constructor(n, ar, from) {
    this.ar = ar;
    this.flags = from ? Uint8Array.from(from.flags) : new Uint8Array(n);
    this.mu = from ? Array.from(from.mu) : ar.ones(n);
    this.spanA = from ? Array.from(from.spanA) : ar.ones(n);
    this.spanB = from ? Array.from(from.spanB) : ar.ones(n);
    this.why = from ? Uint8Array.from(from.why) : new Uint8Array(n);
  }
  ar;
  flags;
  mu;
  spanA;
  spanB;
  why;
  /**
   * A node that reads side A only (dep 1; `span` = the rank of its coordinates as functions of
   * x_A), side B only (dep 2), or nothing (dep 0, a constant: one function, counted with side A).
   */
  pure(v, dep, span) {
    const ar = this.ar;
    this.flags[v] = dep === 2 ? B2 : A2;
    this.mu[v] = ar.zero;
    this.spanA[v] = dep === 2 ? ar.zero : dep === 0 ? ar.one : span;
    this.spanB[v] = dep === 2 ? span : ar.zero;
    this.why[v] = PARTS_FROM_CHILDREN;
  }
  /**
   * A node that reads both sides: its decomposition from its children's. Returns flags + μ, a
   * bound on the separation rank of its functionals. `cap`: λ(v) as the other rules bound it; once
   * μ passes it the node will take the trivial decomposition anyway (settle), so the work stops
   * there and `cap` is returned.
   */
  mixed(c, plan, v, D, cap) {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x, y) => ar.le(x, y) ? x : y;
    const kind = c.op[v];
    if (kind === OP_LINEAR ? this.why[c.childList[c.childStart[v]]] === PARTS_TRIVIAL : this.allTrivial(plan, v)) return this.trivial(v, cap);
    if (kind === OP_LINEAR) {
      const ch = c.childList[c.childStart[v]];
      this.set(v, flags[ch], mu[ch], min(D, spanA[ch]), min(D, spanB[ch]), PARTS_FROM_CHILDREN);
    } else if (kind === OP_SUM) {
      let f2 = 0;
      let m = ar.zero;
      let sa = ar.zero;
      let sb = ar.zero;
      for (let t = plan.start[v]; t < plan.start[v + 1]; t++) {
        const node = plan.childOf[t];
        f2 |= flags[node];
        m = ar.add(m, mu[node]);
        if (!ar.le(m, cap)) return this.trivial(v, cap);
        if (flags[node] & A2 && !ar.le(D, sa)) sa = ar.add(sa, spanA[node]);
        if (flags[node] & B2 && !ar.le(D, sb)) sb = ar.add(sb, spanB[node]);
      }
      this.set(v, f2, m, min(D, sa), min(D, sb), PARTS_FROM_CHILDREN);
    } else if (kind === OP_PRODUCT) {
      const expanded = this.expand(plan, v, D, cap);
      if (expanded === OVER || expanded === NOT_SEPARABLE && !this.fold(plan, v, D, cap)) return this.trivial(v, cap);
    } else if (kind === OP_INPUT || kind === OP_CONST) {
      throw new Error("additive parts: an input or a constant reads one side only");
    }
    const n = (flags[v] & A2 ? 1 : 0) + (flags[v] & B2 ? 1 : 0);
    return n === 0 ? mu[v] : ar.add(ar.of(n), mu[v]);
  }
  allTrivial(plan, v) {
    for (let t = plan.start[v]; t < plan.start[v + 1]; t++) if (this.why[plan.childOf[t]] !== PARTS_TRIVIAL) return false;
    return true;
  }
  trivial(v, cap) {
    this.why[v] = PARTS_TRIVIAL;
    return cap;
  }
  /** Once λ(v) is final: the trivial decomposition (μ = λ, no flags) when it is better. */
  settle(v, lambda) {
    if (this.why[v] === PARTS_TRIVIAL || !this.ar.le(this.mu[v], lambda)) {
      const zero = this.ar.zero;
      this.set(v, 0, lambda, zero, zero, PARTS_TRIVIAL);
    }
  }
  set(v, f2, m, sa, sb, why) {
    this.flags[v] = f2;
    this.mu[v] = m;
    this.spanA[v] = sa;
    this.spanB[v] = sb;
    this.why[v] = why;
  }
  /**
   * A product of separable factors (μ = 0 each), expanded: factor i, appearing a_i times, gives
   * (P_A^i + P_B^i)^{a_i} = Σ_j C(a_i, j)·(P_A^i)^j ⊙ (P_B^i)^{a_i − j} (elementwise products
   * commute), so a term is a choice of j_i per distinct factor, and the coordinates of (P_A^i)^j
   * span at most C(σ + j − 1, j) functions (a symmetric power).
   */
  expand(plan, v, D, cap) {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x, y) => ar.le(x, y) ? x : y;
    const from = plan.start[v];
    const to = plan.start[v + 1];
    let allA = true;
    let allB = true;
    let sa = ar.one;
    let sb = ar.one;
    let fullSpans = true;
    let choices = 1;
    for (let t = from; t < to; t++) {
      const ch = plan.childOf[t];
      const f2 = flags[ch];
      if (!ar.le(mu[ch], ar.zero) || f2 === 0) return NOT_SEPARABLE;
      const a = plan.times[t];
      allA &&= (f2 & A2) !== 0;
      allB &&= (f2 & B2) !== 0;
      if (f2 & A2) sa = ar.mul(sa, ar.symPow(spanA[ch], a));
      if (f2 & B2) sb = ar.mul(sb, ar.symPow(spanB[ch], a));
      fullSpans &&= (!(f2 & A2) || ar.le(D, spanA[ch])) && (!(f2 & B2) || ar.le(D, spanB[ch]));
      if (f2 === (A2 | B2)) choices *= a + 1;
      if (choices > MAX_TERMS) return NOT_SEPARABLE;
    }
    const flagsOut = (allA ? A2 : 0) | (allB ? B2 : 0);
    const spanOutA = allA ? min(D, sa) : ar.zero;
    const spanOutB = allB ? min(D, sb) : ar.zero;
    const mixedTerms = choices - (allA ? 1 : 0) - (allB ? 1 : 0);
    if (fullSpans) {
      const rest2 = mixedTerms > 0 ? ar.mul(D, ar.of(mixedTerms)) : ar.zero;
      if (!ar.le(rest2, cap)) return OVER;
      this.set(v, flagsOut, rest2, spanOutA, spanOutB, PARTS_EXPANDED);
      return EXPANDED;
    }
    if (mixedTerms > MAX_LISTED_TERMS) return NOT_SEPARABLE;
    const n = to - from;
    const j = new Int32Array(n);
    const lo = new Int32Array(n);
    const hi = new Int32Array(n);
    for (let x = 0; x < n; x++) {
      const ch = plan.childOf[from + x];
      const a = plan.times[from + x];
      lo[x] = flags[ch] & B2 ? 0 : a;
      hi[x] = flags[ch] & A2 ? a : 0;
      j[x] = lo[x];
    }
    let rest = ar.zero;
    for (; ; ) {
      let pa = ar.one;
      let pb = ar.one;
      let atA = true;
      let atB = true;
      for (let x2 = 0; x2 < n; x2++) {
        const ch = plan.childOf[from + x2];
        const a = plan.times[from + x2];
        if (j[x2] > 0) pa = ar.mul(pa, ar.symPow(spanA[ch], j[x2]));
        if (j[x2] < a) pb = ar.mul(pb, ar.symPow(spanB[ch], a - j[x2]));
        atA &&= j[x2] === a;
        atB &&= j[x2] === 0;
      }
      if (!atA && !atB) {
        rest = ar.add(rest, min(D, min(pa, pb)));
        if (!ar.le(rest, cap)) return OVER;
      }
      let x = 0;
      while (x < n && j[x] === hi[x]) {
        j[x] = lo[x];
        x++;
      }
      if (x === n) break;
      j[x]++;
    }
    this.set(v, flagsOut, rest, spanOutA, spanOutB, PARTS_EXPANDED);
    return EXPANDED;
  }
  /** Any product, folded factor by factor (each factor as often as it appears); false once μ passes `cap`. */
  fold(plan, v, D, cap) {
    const ar = this.ar;
    const { flags, mu, spanA, spanB } = this;
    const min = (x, y) => ar.le(x, y) ? x : y;
    let f2 = -1;
    let m = ar.zero;
    let sa = ar.zero;
    let sb = ar.zero;
    for (let t = plan.start[v]; t < plan.start[v + 1]; t++) {
      const ch = plan.childOf[t];
      for (let i = 0; i < plan.times[t]; i++) {
        const [g, mg, ga, gb] = [flags[ch], mu[ch], spanA[ch], spanB[ch]];
        if (f2 < 0) {
          [f2, m, sa, sb] = [g, mg, ga, gb];
          continue;
        }
        let rest = ar.mul(D, ar.mul(m, mg));
        if (f2 & A2 && g & B2) rest = ar.add(rest, min(D, min(sa, gb)));
        if (f2 & B2 && g & A2) rest = ar.add(rest, min(D, min(sb, ga)));
        if (f2 & A2) rest = ar.add(rest, ar.mul(sa, mg));
        if (f2 & B2) rest = ar.add(rest, ar.mul(sb, mg));
        if (g & A2) rest = ar.add(rest, ar.mul(ga, m));
        if (g & B2) rest = ar.add(rest, ar.mul(gb, m));
        const both = f2 & g;
        sa = both & A2 ? min(D, ar.mul(sa, ga)) : ar.zero;
        sb = both & B2 ? min(D, ar.mul(sb, gb)) : ar.zero;
        f2 = both;
        m = rest;
        if (!ar.le(m, cap)) return false;
      }
    }
    this.set(v, Math.max(f2, 0), m, sa, sb, PARTS_FOLDED);
    return true;
  }
};

// src/cut/rank-propagation.ts
var SAFE2 = 2 ** 53;
function big(x) {
  return typeof x === "bigint" ? x : BigInt(x);
}
function mulInt(a, b) {
  if (typeof a === "number" && typeof b === "number") {
    const r = a * b;
    if (r < SAFE2) return r;
  }
  return big(a) * big(b);
}
function addInt(a, b) {
  if (typeof a === "number" && typeof b === "number") {
    const r = a + b;
    if (r < SAFE2) return r;
  }
  return big(a) + big(b);
}
function minInt(a, b) {
  return a <= b ? a : b;
}
function symPowInt(x, a) {
  if (a === 1) return x;
  const n = big(x) + BigInt(a - 1);
  let r = 1n;
  for (let i = 0; i < a; i++) r = r * (n - BigInt(i)) / BigInt(i + 1);
  return r < BigInt(SAFE2) ? Number(r) : r;
}
function symPowLog2(x, a) {
  let r = 0;
  for (let i = 0; i < a; i++) r += (x > 50 ? x : Math.log2(2 ** x + i)) - Math.log2(i + 1);
  return r;
}
var LOG_ARITH = {
  one: 0,
  zero: -Infinity,
  ones: (n) => new Float64Array(n),
  of: (n) => Math.log2(n),
  mul: (a, b) => a + b,
  add: (a, b) => a === -Infinity ? b : b === -Infinity ? a : Math.max(a, b) + Math.log2(1 + 2 ** -Math.abs(a - b)),
  le: (a, b) => a <= b,
  symPow: symPowLog2
};
var DOUBLE_ARITH = {
  one: 1,
  zero: 0,
  ones: (n) => new Float64Array(n).fill(1),
  of: (n) => n,
  mul: (a, b) => a * b,
  add: (a, b) => a + b,
  le: (a, b) => a <= b,
  symPow: (x, a) => x >= SAFE2 ? x : Number(symPowInt(x, a))
};
var INT_ARITH = {
  one: 1,
  zero: 0,
  ones: (n) => new Array(n).fill(1),
  of: (n) => n,
  mul: mulInt,
  add: addInt,
  le: (a, b) => a <= b,
  symPow: symPowInt
};
var FROM_CHILDREN = 0;
var FROM_DIM_OTHER = 1;
var FROM_DIM_KAPPA = 2;
var FROM_PURE = 3;
var FROM_SIDE_A = 4;
var FROM_SIDE_B = 5;
var FROM_PURE_FACTOR = 6;
var FROM_ADDITIVE = 7;
var MAX_BITS = 4e6;
function rankPropagation(c, side, whole = c) {
  const plan = planOf(c);
  const logs = propagateFloat(c, plan, side, true);
  let largest = 0;
  for (let v = 0; v < c.size; v++) largest = Math.max(largest, logs.ra[v], logs.rb[v]);
  const tooLarge2 = () => {
    if (largest > MAX_BITS) return true;
    if (whole === c || ceilingOf(whole) * (1 + 1e-9) + 1 <= MAX_BITS) return false;
    const all = propagateFloat(whole, planOf(whole), side, true);
    let most = 0;
    for (let v = 0; v < whole.size; v++) most = Math.max(most, all.ra[v], all.rb[v]);
    return most > MAX_BITS;
  };
  const rank = () => tooLarge2() ? void 0 : exactTop(c, plan, side);
  let counts;
  return {
    log2: logs.lam[c.top],
    rank,
    get counts() {
      return counts ??= recordWidths(c, plan, logs);
    }
  };
}
var ceilings = /* @__PURE__ */ new WeakMap();
function ceilingOf(c) {
  const hit = ceilings.get(c);
  if (hit !== void 0) return hit;
  const { op, dim, childStart, childList } = c;
  const w = new Float64Array(c.size);
  let most = 0;
  let lastDim = 1;
  let lastLog = 0;
  for (let v = 0; v < c.size; v++) {
    if (dim[v] !== lastDim) {
      lastDim = dim[v];
      lastLog = Math.log2(lastDim);
    }
    let x = lastLog;
    const kind = op[v];
    if (kind === OP_LINEAR) x = Math.max(x, w[childList[childStart[v]]]);
    else if (kind === OP_PRODUCT) {
      let s = 0;
      for (let i = childStart[v]; i < childStart[v + 1]; i++) s += w[childList[i]];
      x = Math.max(x, s);
    } else if (kind === OP_SUM) {
      let m = 0;
      for (let i = childStart[v]; i < childStart[v + 1]; i++) m = Math.max(m, w[childList[i]]);
      x = Math.max(x, m + Math.log2(childStart[v + 1] - childStart[v] + 2));
    }
    w[v] = x;
    most = Math.max(most, x);
  }
  ceilings.set(c, most);
  return most;
}
function propagateFloat(c, plan, side, log) {
  const n = c.size;
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const dep = new Uint8Array(n);
  const ar = log ? LOG_ARITH : DOUBLE_ARITH;
  const { one, zero, of, mul: mul2, add: add2, symPow } = ar;
  const ra = new Float64Array(n).fill(one);
  const rb = new Float64Array(n).fill(one);
  const kap = new Float64Array(n).fill(one);
  const lam = new Float64Array(n).fill(one);
  const whyA = new Uint8Array(n).fill(FROM_PURE);
  const whyB = new Uint8Array(n).fill(FROM_PURE);
  const whyL = new Uint8Array(n).fill(FROM_PURE);
  const lamNoA = new Float64Array(n).fill(one);
  const lamNoB = new Float64Array(n).fill(one);
  const pureParts = new Uint8Array(n);
  const sums = new FloatSums(log);
  const parts = new AdditiveParts(n, ar);
  for (let v = 0; v < n; v++) {
    const kind = op[v];
    if (kind === OP_INPUT) {
      const onA = side[c.position[v]] === 1;
      dep[v] = onA ? 1 : 2;
      if (onA) rb[v] = of(dim[v]);
      else ra[v] = of(dim[v]);
      parts.pure(v, dep[v], onA ? rb[v] : ra[v]);
      continue;
    }
    if (kind === OP_CONST) {
      parts.pure(v, 0, one);
      continue;
    }
    let d = 0;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) d |= dep[childList[i]];
    dep[v] = d;
    const D = of(dim[v]);
    if (d !== 3) {
      const own = kind === OP_LINEAR ? childList[childStart[v]] : -1;
      if (d === 1) rb[v] = own >= 0 ? Math.min(rb[own], D) : D;
      if (d === 2) ra[v] = own >= 0 ? Math.min(ra[own], D) : D;
      parts.pure(v, d, d === 2 ? ra[v] : rb[v]);
      continue;
    }
    let a;
    let b;
    let k;
    let l;
    let lWhy = FROM_CHILDREN;
    let noA;
    let noB;
    if (kind === OP_LINEAR) {
      const ch = childList[childStart[v]];
      a = ra[ch];
      b = rb[ch];
      l = lam[ch];
      k = l;
      noA = lamNoA[ch];
      noB = lamNoB[ch];
      pureParts[v] = pureParts[ch];
    } else if (kind === OP_PRODUCT) {
      a = one;
      b = one;
      k = one;
      for (let t = start[v]; t < start[v + 1]; t++) {
        const ch = childOf[t];
        const m = times[t];
        a = mul2(a, m === 1 ? ra[ch] : symPow(ra[ch], m));
        b = mul2(b, m === 1 ? rb[ch] : symPow(rb[ch], m));
        k = mul2(k, m === 1 ? kap[ch] : symPow(kap[ch], m));
      }
      l = mul2(D, k);
      lWhy = FROM_DIM_KAPPA;
      const pure = pureFactor(start, childOf, times, dep, v);
      if (pure >= 0) {
        const other = otherFactor(start, childOf, v, pure);
        const onA = dep[pure] === 1;
        const span = onA ? rb[pure] : ra[pure];
        const alt = add2(pureParts[other] & (onA ? 1 : 2) ? one : zero, mul2(span, onA ? lamNoA[other] : lamNoB[other]));
        if (alt < l) {
          l = alt;
          lWhy = FROM_PURE_FACTOR;
        }
      }
      noA = l;
      noB = l;
    } else {
      pureParts[v] = sumFloat(v, plan, dep, ra, rb, lam, D, sums);
      a = sums.value(SUM_A);
      b = sums.value(SUM_B);
      l = sums.value(SUM_L);
      noA = sums.value(SUM_NO_A);
      noB = sums.value(SUM_NO_B);
      k = l;
    }
    const additive = parts.mixed(c, plan, v, D, l);
    if (additive < l) {
      l = additive;
      lWhy = FROM_ADDITIVE;
      k = Math.min(k, l);
    }
    whyA[v] = FROM_CHILDREN;
    whyB[v] = FROM_CHILDREN;
    whyL[v] = lWhy;
    const viaB = mul2(D, b);
    const viaA = mul2(D, a);
    const viaK = mul2(D, k);
    if (a > Math.min(viaB, viaK)) {
      whyA[v] = viaB <= viaK ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      a = Math.min(viaB, viaK);
    }
    if (b > Math.min(viaA, viaK)) {
      whyB[v] = viaA <= viaK ? FROM_DIM_OTHER : FROM_DIM_KAPPA;
      b = Math.min(viaA, viaK);
    }
    if (l > Math.min(a, b)) {
      whyL[v] = a <= b ? FROM_SIDE_A : FROM_SIDE_B;
      l = Math.min(a, b);
    }
    ra[v] = a;
    rb[v] = b;
    lam[v] = l;
    kap[v] = Math.min(k, l);
    lamNoA[v] = Math.min(noA, l);
    lamNoB[v] = Math.min(noB, l);
    parts.settle(v, l);
  }
  return { dep, pureParts, ra, rb, kap, lam, lamNoA, lamNoB, whyA, whyB, whyL, parts };
}
function pureFactor(start, childOf, times, dep, v) {
  const t = start[v];
  if (start[v + 1] - t !== 2 || times[t] !== 1 || times[t + 1] !== 1) return -1;
  const x = childOf[t];
  const y = childOf[t + 1];
  const dx = dep[x];
  const dy = dep[y];
  if ((dx === 1 || dx === 2) && dy === 3) return x;
  if ((dy === 1 || dy === 2) && dx === 3) return y;
  return -1;
}
function otherFactor(start, childOf, v, pure) {
  const x = childOf[start[v]];
  return x === pure ? childOf[start[v] + 1] : x;
}
var SUM_A = 0;
var SUM_B = 1;
var SUM_L = 2;
var SUM_NO_A = 3;
var SUM_NO_B = 4;
var SUM_PURE_A_ON_B = 5;
var SUM_PURE_B_ON_A = 6;
var FloatSums = class {
  constructor(log) {
    this.log = log;
  }
  log;
  m = new Float64Array(7);
  s = new Float64Array(7);
  clear(i) {
    this.m[i] = -Infinity;
    this.s[i] = 0;
  }
  add(i, x) {
    if (!this.log) {
      this.s[i] = this.s[i] + x;
      return;
    }
    if (x === -Infinity) return;
    const m = this.m[i];
    if (x > m) {
      this.s[i] = m === -Infinity ? 1 : this.s[i] * 2 ** (m - x) + 1;
      this.m[i] = x;
    } else this.s[i] = this.s[i] + 2 ** (x - m);
  }
  /** The sum (its log2, −∞ for an empty sum, when `log`). */
  value(i) {
    if (!this.log) return this.s[i];
    const m = this.m[i];
    return m === -Infinity ? -Infinity : m + Math.log2(this.s[i]);
  }
};
function termFloat(plan, t, r, log) {
  const { childOf, mStart, members } = plan;
  const node = childOf[t];
  const from = mStart[t];
  const to = mStart[t + 1];
  if (from === to) return r[node];
  let sum = r[members[from]];
  for (let i = from + 1; i < to; i++) {
    const x = r[members[i]];
    sum = log ? Math.max(sum, x) + Math.log2(1 + 2 ** -Math.abs(sum - x)) : sum + x;
  }
  return Math.min(r[node], sum);
}
function sumFloat(v, plan, dep, ra, rb, lam, D, sums) {
  const log = sums.log;
  const { start, childOf } = plan;
  const one = log ? 0 : 1;
  for (let i = SUM_A; i <= SUM_PURE_B_ON_A; i++) sums.clear(i);
  let pureA = false;
  let pureB = false;
  let constant = false;
  for (let t = start[v]; t < start[v + 1]; t++) {
    const d = dep[childOf[t]];
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      sums.add(SUM_PURE_A_ON_B, termFloat(plan, t, rb, log));
    } else if (d === 2) {
      pureB = true;
      sums.add(SUM_PURE_B_ON_A, termFloat(plan, t, ra, log));
    } else {
      sums.add(SUM_A, termFloat(plan, t, ra, log));
      sums.add(SUM_B, termFloat(plan, t, rb, log));
      sums.add(SUM_L, termFloat(plan, t, lam, log));
    }
  }
  const mixed = sums.value(SUM_L);
  const loneConstant = constant && !pureA && !pureB;
  sums.add(SUM_NO_A, mixed);
  sums.add(SUM_NO_B, mixed);
  if (pureB || loneConstant) sums.add(SUM_NO_A, one);
  if (pureA || loneConstant) sums.add(SUM_NO_B, one);
  if (loneConstant) {
    sums.add(SUM_A, one);
    sums.add(SUM_B, one);
    sums.add(SUM_L, one);
  }
  if (pureA) {
    sums.add(SUM_A, one);
    sums.add(SUM_B, Math.min(D, sums.value(SUM_PURE_A_ON_B)));
    sums.add(SUM_L, one);
  }
  if (pureB) {
    sums.add(SUM_A, Math.min(D, sums.value(SUM_PURE_B_ON_A)));
    sums.add(SUM_B, one);
    sums.add(SUM_L, one);
  }
  return (pureA ? 1 : 0) | (pureB ? 2 : 0);
}
var plans2 = /* @__PURE__ */ new WeakMap();
function planOf(c) {
  const hit = plans2.get(c);
  if (hit) return hit;
  const n = c.size;
  const { op, childStart, childList } = c;
  const source = new Int32Array(n);
  const start = new Int32Array(n + 1);
  const links = childList.length;
  const childOf = new Int32Array(links);
  const times = new Int32Array(links);
  const mStart = new Int32Array(links + 1);
  const members = new Int32Array(links);
  const seen = new Int32Array(n);
  const slot = new Int32Array(n);
  const grouped = new Int32Array(n);
  const size = new Int32Array(n);
  const first = new Int32Array(n);
  const place = new Int32Array(n);
  const distinct = new Int32Array(n === 0 ? 0 : maxChildren(c));
  const order = new Int32Array(distinct.length);
  let terms = 0;
  let used = 0;
  for (let v = 0; v < n; v++) {
    start[v] = terms;
    source[v] = op[v] === OP_LINEAR ? source[childList[childStart[v]]] : v;
    if (op[v] !== OP_PRODUCT && op[v] !== OP_SUM) continue;
    const stamp = v + 1;
    let k = 0;
    for (let i = childStart[v]; i < childStart[v + 1]; i++) {
      const ch = childList[i];
      if (seen[ch] === stamp) {
        if (op[v] === OP_PRODUCT) times[slot[ch]]++;
        continue;
      }
      seen[ch] = stamp;
      if (op[v] === OP_PRODUCT) {
        slot[ch] = terms;
        childOf[terms] = ch;
        times[terms] = 1;
        mStart[++terms] = used;
      } else distinct[k++] = ch;
    }
    if (op[v] === OP_PRODUCT) continue;
    let groups = 0;
    for (let j = 0; j < k; j++) {
      const ch = distinct[j];
      const src = source[ch];
      if (grouped[src] !== stamp) {
        grouped[src] = stamp;
        size[src] = 0;
        first[src] = ch;
        order[groups++] = src;
      }
      size[src]++;
    }
    for (let g = 0; g < groups; g++) {
      const src = order[g];
      const alone = size[src] === 1;
      childOf[terms] = alone ? first[src] : src;
      times[terms] = 1;
      place[src] = used;
      if (!alone) used += size[src];
      mStart[++terms] = used;
    }
    for (let j = 0; j < k; j++) {
      const src = source[distinct[j]];
      if (size[src] > 1) members[place[src]++] = distinct[j];
    }
  }
  start[n] = terms;
  const plan = {
    source,
    start,
    childOf: childOf.slice(0, terms),
    times: times.slice(0, terms),
    mStart: mStart.slice(0, terms + 1),
    members: members.slice(0, used)
  };
  plans2.set(c, plan);
  return plan;
}
function maxChildren(c) {
  let most = 0;
  for (let v = 0; v < c.size; v++) most = Math.max(most, c.childStart[v + 1] - c.childStart[v]);
  return most;
}
function exactTop(c, plan, side) {
  const small = propagateFloat(c, plan, side, false);
  const { ra, rb, kap, lam, lamNoA, lamNoB } = small;
  const large = [];
  for (let v = 0; v < c.size; v++) {
    if (ra[v] >= SAFE2 || rb[v] >= SAFE2 || kap[v] >= SAFE2 || lam[v] >= SAFE2 || lamNoA[v] >= SAFE2 || lamNoB[v] >= SAFE2) large.push(v);
  }
  if (large.length === 0) return BigInt(lam[c.top]);
  return big(propagateExact(c, plan, small, large));
}
function propagateExact(c, plan, small, large) {
  const { op, dim, childStart, childList } = c;
  const { start, childOf, times } = plan;
  const { dep, pureParts } = small;
  const slot = new Int32Array(c.size).fill(-1);
  large.forEach((v, i) => slot[v] = i);
  const m = large.length;
  const ex = {
    slot,
    ra: new Array(m),
    rb: new Array(m),
    kap: new Array(m),
    lam: new Array(m),
    lamNoA: new Array(m),
    lamNoB: new Array(m)
  };
  const at = (doubles, exact2, v) => valueAt2(doubles, exact2, slot, v);
  const parts = new AdditiveParts(c.size, INT_ARITH, small.parts);
  const sum = { a: 0, b: 0, l: 0, noA: 0, noB: 0 };
  for (let i = 0; i < m; i++) {
    const v = large[i];
    const kind = op[v];
    const D = dim[v];
    let a;
    let b;
    let k;
    let l;
    let noA;
    let noB;
    if (kind === OP_LINEAR) {
      const ch = childList[childStart[v]];
      a = at(small.ra, ex.ra, ch);
      b = at(small.rb, ex.rb, ch);
      l = at(small.lam, ex.lam, ch);
      k = l;
      noA = at(small.lamNoA, ex.lamNoA, ch);
      noB = at(small.lamNoB, ex.lamNoB, ch);
    } else if (kind === OP_PRODUCT) {
      a = 1;
      b = 1;
      k = 1;
      for (let t = start[v]; t < start[v + 1]; t++) {
        const ch = childOf[t];
        const mult = times[t];
        a = mulInt(a, symPowInt(at(small.ra, ex.ra, ch), mult));
        b = mulInt(b, symPowInt(at(small.rb, ex.rb, ch), mult));
        k = mulInt(k, symPowInt(at(small.kap, ex.kap, ch), mult));
      }
      l = mulInt(D, k);
      const pure = pureFactor(start, childOf, times, dep, v);
      if (pure >= 0) {
        const other = otherFactor(start, childOf, v, pure);
        const onA = dep[pure] === 1;
        const span = onA ? at(small.rb, ex.rb, pure) : at(small.ra, ex.ra, pure);
        const alt = addInt(pureParts[other] & (onA ? 1 : 2) ? 1 : 0, mulInt(span, onA ? at(small.lamNoA, ex.lamNoA, other) : at(small.lamNoB, ex.lamNoB, other)));
        if (!(l <= alt)) l = alt;
      }
      noA = l;
      noB = l;
    } else if (kind === OP_SUM) {
      sumExact(plan, v, D, dep, small, ex, sum);
      ({ a, b, l, noA, noB } = sum);
      k = l;
    } else {
      throw new Error(`rank propagation: node kind ${kind} with a value beyond 2^53`);
    }
    const additive = parts.mixed(c, plan, v, D, l);
    if (!(l <= additive)) {
      l = additive;
      k = minInt(k, l);
    }
    const viaB = mulInt(D, b);
    const viaA = mulInt(D, a);
    const viaK = mulInt(D, k);
    if (!(a <= minInt(viaB, viaK))) a = minInt(viaB, viaK);
    if (!(b <= minInt(viaA, viaK))) b = minInt(viaA, viaK);
    if (!(l <= minInt(a, b))) l = minInt(a, b);
    ex.ra[i] = a;
    ex.rb[i] = b;
    ex.lam[i] = l;
    ex.kap[i] = minInt(k, l);
    ex.lamNoA[i] = minInt(noA, l);
    ex.lamNoB[i] = minInt(noB, l);
    parts.settle(v, l);
  }
  return at(small.lam, ex.lam, c.top);
}
function valueAt2(doubles, exact2, slot, v) {
  const i = slot[v];
  return i >= 0 ? exact2[i] : doubles[v];
}
function termExact(plan, t, doubles, exact2, slot) {
  const { childOf, mStart, members } = plan;
  const node = valueAt2(doubles, exact2, slot, childOf[t]);
  if (mStart[t + 1] === mStart[t]) return node;
  let sum = valueAt2(doubles, exact2, slot, members[mStart[t]]);
  for (let i = mStart[t] + 1; i < mStart[t + 1]; i++) sum = addInt(sum, valueAt2(doubles, exact2, slot, members[i]));
  return minInt(node, sum);
}
function sumExact(plan, v, D, dep, small, ex, out) {
  const slot = ex.slot;
  let a = 0;
  let b = 0;
  let l = 0;
  let pureA = false;
  let pureB = false;
  let constant = false;
  let pureAonB = 0;
  let pureBonA = 0;
  for (let t = plan.start[v]; t < plan.start[v + 1]; t++) {
    const d = dep[plan.childOf[t]];
    if (d === 0) constant = true;
    else if (d === 1) {
      pureA = true;
      pureAonB = addInt(pureAonB, termExact(plan, t, small.rb, ex.rb, slot));
    } else if (d === 2) {
      pureB = true;
      pureBonA = addInt(pureBonA, termExact(plan, t, small.ra, ex.ra, slot));
    } else {
      a = addInt(a, termExact(plan, t, small.ra, ex.ra, slot));
      b = addInt(b, termExact(plan, t, small.rb, ex.rb, slot));
      l = addInt(l, termExact(plan, t, small.lam, ex.lam, slot));
    }
  }
  const loneConstant = constant && !pureA && !pureB;
  out.noA = pureB || loneConstant ? addInt(l, 1) : l;
  out.noB = pureA || loneConstant ? addInt(l, 1) : l;
  if (loneConstant) {
    a = addInt(a, 1);
    b = addInt(b, 1);
    l = addInt(l, 1);
  }
  if (pureA) {
    a = addInt(a, 1);
    b = addInt(b, minInt(D, pureAonB));
    l = addInt(l, 1);
  }
  if (pureB) {
    a = addInt(a, minInt(D, pureBonA));
    b = addInt(b, 1);
    l = addInt(l, 1);
  }
  out.a = a;
  out.b = b;
  out.l = l;
}
function recordWidths(c, plan, p) {
  const { dep, whyA, whyB, whyL } = p;
  const whyM = p.parts.why;
  const counts = /* @__PURE__ */ new Map();
  const seen = new Uint8Array(8 * c.size);
  const note = (v) => {
    const tag = c.bondTag[v];
    let byDim = counts.get(tag);
    if (!byDim) counts.set(tag, byDim = /* @__PURE__ */ new Map());
    byDim.set(c.dim[v], (byDim.get(c.dim[v]) ?? 0) + 1);
  };
  const A3 = 0;
  const B3 = 1;
  const K = 2;
  const L = 3;
  const MIX = 4;
  const farSide = (v, which) => which === A3 && dep[v] === 2 || which === B3 && dep[v] === 1;
  const stack = [c.top * 8 + L];
  const push = (v, which) => {
    stack.push(v * 8 + which);
  };
  while (stack.length > 0) {
    const key = stack.pop();
    if (seen[key] === 1) continue;
    seen[key] = 1;
    const v = key >>> 3;
    const which = key & 7;
    const kind = c.op[v];
    if (kind === OP_CONST) continue;
    if (which === MIX) {
      if (dep[v] !== 3) continue;
      const how = whyM[v];
      if (how === PARTS_TRIVIAL) push(v, L);
      else if (how === PARTS_EXPANDED) note(v);
      else if (how === PARTS_FOLDED) {
        note(v);
        for (let t = plan.start[v]; t < plan.start[v + 1]; t++) if (dep[plan.childOf[t]] === 3) push(plan.childOf[t], MIX);
      } else if (kind === OP_SUM) {
        for (let t = plan.start[v]; t < plan.start[v + 1]; t++) if (dep[plan.childOf[t]] === 3) push(plan.childOf[t], MIX);
      } else push(c.childList[c.childStart[v]], MIX);
      continue;
    }
    const why = which === A3 ? whyA[v] : which === B3 ? whyB[v] : which === L ? whyL[v] : FROM_CHILDREN;
    if (kind === OP_INPUT || dep[v] !== 3 || why === FROM_PURE) {
      if (farSide(v, which)) note(v);
      continue;
    }
    if (why === FROM_ADDITIVE) {
      push(v, MIX);
      continue;
    }
    if (why === FROM_SIDE_A || why === FROM_SIDE_B) {
      push(v, why === FROM_SIDE_A ? A3 : B3);
      continue;
    }
    if (why === FROM_PURE_FACTOR) {
      const pure = pureFactor(plan.start, plan.childOf, plan.times, dep, v);
      note(pure);
      push(otherFactor(plan.start, plan.childOf, v, pure), L);
      continue;
    }
    if (why === FROM_DIM_OTHER || why === FROM_DIM_KAPPA) {
      note(v);
      push(v, why === FROM_DIM_KAPPA ? K : which === A3 ? B3 : A3);
      continue;
    }
    if (kind === OP_SUM) {
      const sub2 = which === K ? L : which;
      for (let t = plan.start[v]; t < plan.start[v + 1]; t++) {
        const node = plan.childOf[t];
        if (dep[node] === 3) push(node, sub2);
        else if (farSide(node, sub2)) note(v);
      }
      continue;
    }
    if (kind === OP_PRODUCT) {
      for (let t = plan.start[v]; t < plan.start[v + 1]; t++) push(plan.childOf[t], which);
      continue;
    }
    push(c.childList[c.childStart[v]], which === K ? L : which);
  }
  return counts;
}

// src/cut/special-cases.ts
var ZERO_PRESERVING = /* @__PURE__ */ new Set(["pointwise", "pool", "upsample", "flatten"]);
function specialCases(original, surrogate, shapes, reading) {
  let model = original;
  let under = surrogate;
  const steps = [];
  if (surrogate === "overlap") {
    const tapped = treeSpecialCase(model, shapes);
    if (!tapped) return [];
    under = "tree";
    steps.push(tapped === model ? "off-centre taps zeroed" : "all taps but one zeroed");
    model = tapped;
  }
  if (model.layers.some((l) => l.kind === "position" && l.mode === "fixed")) return [];
  const pinned = {
    ...model,
    input: { ...model.input, representation: shapes.representation },
    output: { ...model.output, position: shapes.output.position }
  };
  const base = bypass(pinned, (l) => l.kind === "position");
  const verified = (r) => r ? readSame(r, shapes, reading) : void 0;
  if (!model.layers.some((l) => l.kind === "merge")) {
    const only = verified(base);
    return only ? [{ model: only, surrogate: under, how: steps.join(", ") }] : [];
  }
  const cases = [];
  for (const pick of ["first", "last"]) {
    const reduced = keepOneInput(base.model, pick);
    const found = verified(reduced && { model: reduced.model, from: reduced.from.map((k) => base.from[k]) });
    if (found) cases.push({ model: found, surrogate: under, how: [...steps, `merges keep their ${pick} input where the others can be zeroed`].join(", ") });
  }
  return cases;
}
function readSame(r, shapes, reading) {
  const shaped = inferShapes(r.model);
  if (!shaped.ok) return void 0;
  const again = readPointwise(r.model, shaped.shapes);
  for (let k = 0; k < r.from.length; k++) {
    const i = r.from[k];
    if (reading.squared.has(i) !== again.squared.has(k) || reading.ignored.has(i) !== again.ignored.has(k)) return void 0;
    if (shapes.denseReading[i] !== shaped.shapes.denseReading[k]) return void 0;
  }
  return r.model;
}
function bypass(model, drop) {
  const through = /* @__PURE__ */ new Map();
  const resolve3 = (i) => i === INPUT ? INPUT : through.get(i) ?? i;
  const kept = [];
  const newIndex = /* @__PURE__ */ new Map();
  for (const l of model.layers) {
    if (drop(l)) {
      through.set(l.index, resolve3(l.inputs[0]));
      continue;
    }
    newIndex.set(l.index, kept.length);
    kept.push(l);
  }
  const renumber = (i) => {
    const r = resolve3(i);
    return r === INPUT ? INPUT : newIndex.get(r);
  };
  return {
    model: { ...model, layers: kept.map((l, k) => ({ ...l, index: k, inputs: l.inputs.map(renumber) })) },
    from: kept.map((l) => l.index)
  };
}
function treeSpecialCase(model, shapes) {
  let changed = false;
  const layers = [];
  for (const l of model.layers) {
    const before = l.inputs[0] === INPUT ? model.input.shape : shapes.layers[l.inputs[0]]?.shape;
    if (l.kind === "conv") {
      if (l.stride.some((s) => s !== 1)) {
        const one = before && keepOneTap(l, before);
        if (!one) return void 0;
        layers.push(one);
        changed = true;
        continue;
      }
      if (l.padding.mode !== "causal" && l.kernel.some((k, a) => !centreIsTap(k, l.dilation[a]))) return void 0;
    } else if (l.kind === "conv-transpose") {
      const after = shapes.layers[l.index].shape;
      for (let a = 0; a < after.length; a++) {
        const s = l.stride[a];
        const d = l.dilation[a];
        const p = l.padding[a];
        if (after[a] > before[a] * s) return void 0;
        for (let u = 0; u < Math.min(s, after[a]); u++) {
          if ((u + p) % d !== 0 || (u + p) / d >= l.kernel[a]) return void 0;
        }
      }
    } else if (l.kind === "upsample" && l.mode === "linear") {
      return void 0;
    }
    layers.push(l);
  }
  return changed ? { ...model, layers } : model;
}
function centreIsTap(k, d) {
  return Math.floor((extent(k, d) - 1) / 2) % d === 0;
}
function keepOneTap(l, before) {
  const kernel = [...l.kernel];
  const dilation = [...l.dilation];
  const amount = l.padding.mode === "explicit" ? [...l.padding.amount] : [];
  for (let a = 0; a < kernel.length; a++) {
    const s = l.stride[a];
    const n = before[a];
    const k = l.kernel[a];
    const d = l.dilation[a];
    if (s === 1) {
      if (l.padding.mode !== "causal" && !centreIsTap(k, d)) return void 0;
      continue;
    }
    const wide = windowAxis(n, k, s, d, l.padding, a);
    if (typeof wide === "string") return void 0;
    let found = false;
    for (let t = 0; t < k && !found; t++) {
      const padding = l.padding.mode === "explicit" ? { mode: "explicit", amount: amount.map((x, i) => i === a ? wide.left - t * d : x) } : l.padding;
      if (l.padding.mode === "explicit" && wide.left - t * d < 0) continue;
      const one = windowAxis(n, 1, s, 1, padding, a);
      if (typeof one === "string" || one.out !== wide.out || one.left !== wide.left - t * d) continue;
      if (l.padding.mode === "explicit") amount[a] = wide.left - t * d;
      found = true;
    }
    if (!found) return void 0;
    kernel[a] = 1;
    dilation[a] = 1;
  }
  return { ...l, kernel, dilation, ...l.padding.mode === "explicit" ? { padding: { mode: "explicit", amount } } : {} };
}
function keepOneInput(model, pick) {
  const layers = model.layers;
  const consumers = layers.map(() => []);
  for (const l of layers) for (const i of l.inputs) if (i !== INPUT) consumers[i].push(l.index);
  const replaced = /* @__PURE__ */ new Map();
  const resolve3 = (i) => replaced.get(i) ?? i;
  for (const l of layers) {
    if (l.kind !== "merge") continue;
    const coordinatewise = l.mode === "concat" && onlyCoordinatewiseUntilWeighted(layers, consumers, l.index);
    const canKeep = (keptAt2) => coordinatewise || l.inputs.every((d, k) => k === keptAt2 || zeroable(layers, consumers, d, l.index));
    const ends = pick === "first" ? [0, l.inputs.length - 1] : [l.inputs.length - 1, 0];
    const keptAt = ends.find(canKeep);
    if (keptAt === void 0) return void 0;
    replaced.set(l.index, resolve3(l.inputs[keptAt]));
  }
  const last = resolve3(layers.length - 1);
  const live = /* @__PURE__ */ new Set();
  const stack = [last];
  while (stack.length > 0) {
    const i = stack.pop();
    if (i === INPUT || live.has(i)) continue;
    live.add(i);
    for (const j of layers[i].inputs) stack.push(resolve3(j));
  }
  const order = layers.filter((l) => live.has(l.index) && l.kind !== "merge");
  const newIndex = new Map(order.map((l, k) => [l.index, k]));
  const kept = order.map((l, k) => ({
    ...l,
    index: k,
    inputs: l.inputs.map((j) => {
      const r = resolve3(j);
      return r === INPUT ? INPUT : newIndex.get(r);
    })
  }));
  if (kept.length === 0) return void 0;
  return { model: { ...model, layers: kept }, from: order.map((l) => l.index) };
}
function zeroable(layers, consumers, input, merge) {
  let at = input;
  let reader = merge;
  for (; ; ) {
    if (at === INPUT) return false;
    const uses = consumers[at];
    if (uses.length !== 1 || uses[0] !== reader) return false;
    const l = layers[at];
    if (WEIGHTED_KINDS.has(l.kind)) return true;
    if (!ZERO_PRESERVING.has(l.kind)) return false;
    reader = at;
    at = l.inputs[0];
  }
}
function onlyCoordinatewiseUntilWeighted(layers, consumers, from) {
  const stack = [from];
  const seen = /* @__PURE__ */ new Set();
  while (stack.length > 0) {
    const i = stack.pop();
    if (seen.has(i)) continue;
    seen.add(i);
    for (const c of consumers[i]) {
      const l = layers[c];
      if (WEIGHTED_KINDS.has(l.kind)) continue;
      if (!ZERO_PRESERVING.has(l.kind)) return false;
      stack.push(c);
    }
  }
  return true;
}

// src/cut/attention-lower.ts
var ZERO2 = 0;
var BEFORE = 1;
var MIXED2 = 2;
function perPositionMap(l, shapes) {
  return l.kind === "embedding" || l.kind === "dense" && shapes.denseReading[l.index] !== "input" || l.kind === "conv" && l.groups === 1 && l.kernel.every((k) => k === 1) && l.stride.every((s) => s === 1);
}
function attentionOnInput(model, shapes, reading) {
  const state = [];
  let m = shapes.representation;
  let found;
  const inputState = (i) => i < 0 ? BEFORE : state[i];
  for (const l of model.layers) {
    const ins = l.inputs.map(inputState);
    if (l.kind === "merge") {
      if (!found) return void 0;
      state.push(Math.max(...ins));
      continue;
    }
    if (ins.length !== 1) return void 0;
    const s = ins[0];
    if (l.kind === "attention") {
      if (found) {
        state.push(ZERO2);
        continue;
      }
      if (s !== BEFORE) return void 0;
      const d = l.inputs[0] < 0 ? shapes.representation : shapes.layers[l.inputs[0]].width;
      const s2 = l.heads * shapes.headDims[l.index];
      found = { k: Math.min(s2, d, m), causal: l.causal, window: l.window };
      state.push(MIXED2);
      continue;
    }
    if (l.kind === "pointwise" && reading.squared.has(l.index)) return void 0;
    if (l.kind === "pointwise" || l.kind === "position") {
      state.push(s);
      continue;
    }
    if (!perPositionMap(l, shapes)) return void 0;
    if (!found) m = Math.min(m, shapes.layers[l.index].width);
    state.push(s);
  }
  if (!found || state[state.length - 1] !== MIXED2) return void 0;
  const last = shapes.layers[shapes.layers.length - 1].shape;
  if (last.length !== model.input.shape.length || last.some((n, i) => n !== model.input.shape[i])) return void 0;
  let output = 0;
  for (let axis = 0; axis < last.length; axis++) output = output * last[axis] + shapes.output.position[axis];
  return { ...found, output, vocabulary: model.input.vocabulary };
}
function attentionLower(on, p, oneDimensional) {
  const o = on.output;
  const near = p.side[o];
  const attends = (j) => !(on.causal && j > o) && !(on.window !== void 0 && oneDimensional && Math.abs(o - j) > on.window);
  let far = false;
  let nearOther = false;
  for (let j = 0; j < p.side.length; j++) {
    if (!attends(j)) continue;
    if (p.side[j] !== near) far = true;
    else if (j !== o) nearOther = true;
  }
  if (!far) return void 0;
  const k = BigInt(on.k);
  let rank;
  if (on.vocabulary === void 0) rank = k + 1n;
  else if (on.k < on.vocabulary) rank = nearOther ? k + 1n : k;
  else rank = k - 1n;
  if (rank <= 1n) return void 0;
  return { rank, log2: log2Big(rank), method: "one attention layer, the rest passed through", cut: [] };
}

// src/cut/bounds.ts
function withExplicitProbe(model, p, found, options, target) {
  const known = found.lower?.rank ?? 0n;
  if (target === null || known >= found.upper.rank) return found;
  if (target !== void 0 && (known >= target || target > found.upper.rank)) return found;
  const probed = explicitProbe(model, p.side, known, options.probeBudget);
  if (!probed) return found;
  if (probed.rank > found.upper.rank) throw new Error(`explicit bounds: probe ${probed.rank} exceeds upper ${found.upper.rank} (bug)`);
  return { upper: found.upper, lower: probed };
}
function computeBounds(model, partitions, options) {
  if (model.kind === "explicit") {
    const results2 = partitions.map((p, i) => finish(p.label, withExplicitProbe(model, p, explicitBounds(model, p), options, options.probeTargets?.[i])));
    const notes = ["an explicit tensor network is analysed as given: the surrogate setting does not apply to it"];
    return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes, partitions: results2 } };
  }
  const analysis = analyseLayered(model, options);
  if (!analysis.ok) return analysis;
  const results = [];
  for (const [i, p] of partitions.entries()) {
    const r = analysis.bounds(p, options.probeTargets?.[i]);
    if ("diagnostic" in r) return { ok: false, diagnostics: [r.diagnostic] };
    results.push(r);
  }
  return { ok: true, result: { file: model.file, surrogate: options.surrogate, notes: analysis.notes, partitions: results } };
}
function analyseLayered(model, options) {
  const built = buildCircuit(model, options);
  if (!built.ok) return built;
  const circuit = headCone(built.circuit);
  const notes = [...built.notes];
  if (circuit.sums) {
    notes.push("the network has sums (overlapping windows, merges, flatten + dense): a min-cut index carries one extra constant coordinate (dimension + 1), and rank propagation adds the ranks of summed terms");
  }
  const augment = circuit.sums ? 1 : 0;
  const upperWeights = new Float64Array(circuit.size);
  for (let v = 0; v < circuit.size; v++) upperWeights[v] = Math.log2(circuit.dim[v] + augment);
  const hasRecurrent = model.layers.some((l) => l.kind === "recurrent");
  const symmetric = model.weightSharing && !hasRecurrent && !circuit.sums;
  const lowerNetworks = lowerCircuits(model, options, built.shapes, built.pointwise, hasRecurrent);
  const probe = certifiedProbe(model, built.shapes, built.pointwise, options.surrogate, options.probeBudget);
  let degrees;
  const bounds = (p, probeTarget) => {
    const cut2 = treeMinCut(circuit, p.side, upperWeights, { symmetric });
    const reach = circuit.reuse && cut2.value > 0 ? sideReach(circuit, p.side) : null;
    const deg = reach && degreeBound(circuit, p.side, reach);
    const graded = reach && gradedDegreeBound(circuit, reach, degrees ??= totalDegrees(circuit));
    const gradedLog2 = graded ? log2Big(graded.rank) : Infinity;
    const ideal = reach && partnerIdealBound(circuit, reach);
    const prop = circuit.sums && cut2.value > 0 ? rankPropagation(circuit, p.side, built.circuit) : null;
    const vocabulary = model.input.vocabulary;
    const tokenSide = vocabulary === void 0 ? 0 : Math.min(...sideSizes(p.side));
    const tokens = vocabulary === void 0 ? Infinity : tokenSide * Math.log2(vocabulary);
    const best = Math.min(cut2.value, deg?.log2 ?? Infinity, gradedLog2, ideal?.log2 ?? Infinity, prop?.log2 ?? Infinity, tokens);
    if (best > MAX_RANK_BITS) {
      const method = best === cut2.value ? "min-cut" : best === prop?.log2 ? "rank propagation" : best === deg?.log2 ? "degree" : best === gradedLog2 ? "graded degree" : best === ideal?.log2 ? "partner ideal" : "token count";
      const counts = method === "min-cut" ? cut2.counts : method === "rank propagation" ? prop.counts : method === "degree" ? deg.counts : method === "graded degree" ? graded.counts : method === "partner ideal" ? ideal.counts : /* @__PURE__ */ new Map();
      const upper2 = { rank: HUGE_RANK, log2: best, huge: true, method, cut: cutEntries(circuit, counts, method === "min-cut" ? augment : 0) };
      return finish(p.label, { upper: upper2, lower: bestLower(p, upper2, probeTarget) });
    }
    const candidates2 = [
      { log2: cut2.value, make: () => makeBound(productOf2(cut2.counts, augment), "min-cut", circuit, cut2.counts, augment) }
    ];
    if (deg) candidates2.push({ log2: deg.log2, make: () => makeBound(deg.rank(), "degree", circuit, deg.counts, 0) });
    if (graded) candidates2.push({ log2: gradedLog2, make: () => makeBound(graded.rank, "graded degree", circuit, graded.counts, 0) });
    if (ideal) candidates2.push({ log2: ideal.log2, make: () => makeBound(ideal.rank(), "partner ideal", circuit, ideal.counts, 0) });
    if (vocabulary !== void 0) {
      candidates2.push({
        log2: tokens,
        make: () => ({ rank: BigInt(vocabulary) ** BigInt(tokenSide), log2: tokens, method: "token count", cut: [{ layer: "input", line: model.input.span.line, dim: vocabulary, count: tokenSide }] })
      });
    }
    if (prop) {
      candidates2.push({
        log2: prop.log2,
        make: () => {
          const rank = prop.rank();
          return rank === void 0 ? void 0 : makeBound(rank, "rank propagation", circuit, prop.counts, 0);
        }
      });
    }
    let upper;
    for (const c of candidates2) {
      if (c.log2 > best + 1) continue;
      const b = c.make();
      if (b && (!upper || b.rank < upper.rank)) upper = b;
    }
    return finish(p.label, { upper, lower: bestLower(p, upper, probeTarget) });
  };
  const attentionModel = attentionOnInput(model, built.shapes, built.pointwise);
  const recurrent3 = recurrentOnInput(model, built.shapes);
  const bestLower = (p, upper, probeTarget) => {
    const lowers = [];
    for (const net of lowerNetworks) lowers.push(...net.lower(p.side));
    for (const chain2 of recurrent3?.chains ?? []) {
      const side = chainSide(p.side, chain2);
      const published = publishedRecurrentLower(recurrent3, chain2, side);
      if (published) lowers.push(published);
      const shallow = shallowRecurrentLower(recurrent3, chain2, side);
      if (shallow) lowers.push(shallow);
    }
    const attention3 = attentionModel && attentionLower(attentionModel, p, model.input.shape.length === 1);
    if (attention3) lowers.push(attention3);
    let lower = null;
    for (const l of lowers) if (!lower || l.rank > lower.rank) lower = l;
    if (!probe || probeTarget === null) return lower;
    if (probeTarget !== void 0 && probeTarget > upper.rank) return lower;
    const goal = probeTarget ?? upper.rank;
    if (!lower || lower.rank < goal) return probe(p.side, lower?.rank ?? 0n, goal) ?? lower;
    return lower;
  };
  return { ok: true, notes, bounds };
}
function lowerCircuits(model, options, shapes, reading, hasRecurrent) {
  const out = [];
  for (const sc of specialCases(model, options.surrogate, shapes, reading)) {
    const built = buildCircuit(sc.model, { ...options, surrogate: sc.surrogate, groupedAsIdentity: true });
    if (!built.ok || built.circuit.sums) continue;
    let top = built.circuit.top;
    while (built.circuit.op[top] === OP_LINEAR) top = built.circuit.childList[built.circuit.childStart[top]];
    const c = headCone({ ...built.circuit, top });
    const suffix = sc.how ? ` (${sc.how})` : "";
    const rounding = !model.weightSharing && !hasRecurrent && !c.reuse ? roundingPlan(c, built.circuit.dim) : void 0;
    const topWindow = model.weightSharing && !hasRecurrent && !c.reuse;
    out.push({
      lower: (side) => {
        const found = [];
        const tag = (b) => ({ ...b, method: b.method + suffix });
        if (rounding) found.push(tag(roundingLower(c, side, rounding)));
        found.push(tag(diagonalLower(c, side)));
        if (topWindow) {
          const top2 = topWindowLower(c, side);
          if (top2 !== void 0) found.push(tag({ rank: top2, log2: log2Big(top2), method: "top-window span", cut: [] }));
          const split = splitWindowLower(c, side);
          if (split !== void 0 && split > 1n) found.push(tag({ rank: split, log2: log2Big(split), method: "split windows", cut: [] }));
        }
        return found;
      }
    });
  }
  return out;
}
var NOT_ZERO = { rank: 1n, log2: 0, method: "the output is not zero", cut: [] };
function finish(label, b) {
  const upper = b.upper;
  const found = b.lower && !b.lower.huge && b.lower.log2 > MAX_RANK_BITS ? { ...b.lower, rank: HUGE_RANK, huge: true } : b.lower;
  const lower = !found && !upper.huge && upper.rank === 1n ? NOT_ZERO : found;
  const above = lower && (lower.huge || upper.huge ? lower.log2 > upper.log2 + 1e-9 * upper.log2 : lower.rank > upper.rank);
  const shown = (x) => x.huge ? `2^${x.log2}` : String(x.rank);
  if (above) throw new Error(`unsound bounds for '${label}': lower ${shown(lower)} (${lower.method}) > upper ${shown(upper)} (${upper.method})`);
  const status = !lower ? "upper-only" : boundsMeet(lower, upper) ? "exact" : "bounded";
  return { partition: label, upper, lower, status };
}
function productOf2(counts, augment) {
  const byDim = /* @__PURE__ */ new Map();
  for (const m of counts.values()) {
    for (const [dim, k] of m) {
      if (dim + augment === 1) continue;
      if (!Number.isSafeInteger(k)) throw new Error("cut multiplicity beyond exact integers");
      byDim.set(dim + augment, (byDim.get(dim + augment) ?? 0n) + BigInt(k));
    }
  }
  let r = 1n;
  for (const [d, k] of byDim) r *= BigInt(d) ** k;
  return r;
}
function makeBound(rank, method, c, counts, augment) {
  return { rank, log2: log2Big(rank), method, cut: cutEntries(c, counts, augment) };
}
function cutEntries(c, counts, augment) {
  const entries2 = [];
  for (const [tag, byDim] of counts) {
    const t = c.tags[tag];
    for (const [dim, count] of byDim) {
      if (dim + augment === 1 && !Number.isSafeInteger(count)) continue;
      entries2.push({ layer: t.label, line: t.line, dim: dim + augment, count });
    }
  }
  return entries2.sort((a, b) => a.line - b.line || a.dim - b.dim || String(a.layer).localeCompare(String(b.layer)));
}
function roundingPlan(c, dims) {
  const qs = powerCandidates(dims);
  return {
    candidates: qs.map((q) => {
      const exponent = /* @__PURE__ */ new Map();
      const w = new Float64Array(c.size);
      for (let v = 0; v < c.size; v++) {
        const d = c.dim[v];
        let e = exponent.get(d);
        if (e === void 0) exponent.set(d, e = floorLog(d, q));
        w[v] = e;
      }
      return { q, weights: w };
    })
  };
}
function roundingLower(c, side, plan) {
  let best;
  for (const { q, weights } of plan.candidates) {
    const cut2 = treeMinCut(c, side, weights);
    const log2 = cut2.value * Math.log2(q);
    if (log2 > MAX_RANK_BITS) {
      if (!best || log2 > best.log2) best = { rank: HUGE_RANK, log2, huge: true, method: `power-rounding q=${q}`, cut: [] };
      continue;
    }
    if (best?.huge) continue;
    const rank = BigInt(q) ** BigInt(cut2.value);
    if (!best || rank > best.rank) {
      const counts = /* @__PURE__ */ new Map();
      for (const [tag, byDim] of cut2.counts) {
        const m = /* @__PURE__ */ new Map();
        for (const [dim, k] of byDim) m.set(q ** floorLog(dim, q), (m.get(q ** floorLog(dim, q)) ?? 0) + k);
        counts.set(tag, m);
      }
      best = { rank, log2: log2Big(rank), method: `power-rounding q=${q}`, cut: cutEntries(c, counts, 0) };
    }
  }
  return best;
}
function diagonalLower(c, side) {
  const reached = new Uint8Array(c.size);
  reached[c.top] = 1;
  let q = Infinity;
  let sides = 0;
  for (let v = c.size - 1; v >= 0; v--) {
    if (!reached[v]) continue;
    q = Math.min(q, c.dim[v]);
    if (c.op[v] === OP_INPUT) sides |= side[c.position[v]] === 1 ? 1 : 2;
    for (let i = c.childStart[v]; i < c.childStart[v + 1]; i++) reached[c.childList[i]] = 1;
  }
  const rank = sides === 3 ? BigInt(q) : 1n;
  return { rank, log2: log2Big(rank), method: "diagonal", cut: [] };
}
function publishedRecurrentLower(on, chain2, side) {
  const first = on.layer;
  if (first.depth < 2) return void 0;
  const t = side.length;
  if (t % 2 !== 0) return void 0;
  const startEnd = resolvePartition("start-end", [t]);
  if (!startEnd.ok || !sameMask(startEnd.partition.side, side)) return void 0;
  const m = Math.min(on.m, first.hidden);
  const rank = binomial(m + t / 2 - 1, t / 2);
  const method = first.depth === 2 ? "published depth-2 recurrent" : "published depth-2 recurrent, lower levels passed through";
  return { rank, log2: log2Big(rank), method: chainMethod(method, on, chain2), cut: [] };
}
function shallowRecurrentLower(on, chain2, side) {
  const first = on.layer;
  if (first.depth < 1) return void 0;
  const [a, b] = sideSizes(side);
  if (a === 0 || b === 0) return void 0;
  const r = BigInt(first.hidden);
  const m = first.depth === 1 ? on.m : Math.min(on.m, first.hidden);
  const bound = sylvesterPowerSpan(m, a, b, r);
  if (bound <= 1n) return void 0;
  const method = first.depth === 1 ? "shallow recurrent span" : "recurrent span, lower levels passed through";
  return { rank: bound, log2: log2Big(bound), method: chainMethod(method, on, chain2), cut: [] };
}
function chainMethod(method, on, chain2) {
  const steps = chain2.from === 0 && chain2.to === on.steps - 1 ? "" : `, steps ${chain2.from}-${chain2.to}`;
  if (!on.layer.bidirectional) return `${method}${steps}`;
  return `${method}, ${chain2.backward ? "forward" : "backward"} chains zeroed${steps}`;
}
function chainSide(side, chain2) {
  const out = side.slice(chain2.from, chain2.to + 1);
  return chain2.backward ? out.reverse() : out;
}
function recurrentOnInput(model, shapes) {
  let m = shapes.representation;
  let recurrent3;
  for (const l of model.layers) {
    if (l.inputs.length !== 1 || l.inputs[0] !== l.index - 1) return void 0;
    if (l.kind === "pointwise") continue;
    if (!recurrent3) {
      if (l.kind === "recurrent") {
        recurrent3 = l;
        continue;
      }
      if (l.kind === "position" && l.mode === "learned") continue;
      if (!perPositionMap(l, shapes)) return void 0;
      m = Math.min(m, shapes.layers[l.index].width);
      continue;
    }
    if (l.kind !== "dense") return void 0;
  }
  if (!recurrent3 || model.input.shape.length !== 1) return void 0;
  const steps = model.input.shape[0];
  if (recurrent3.sequence && shapes.layers[shapes.layers.length - 1].shape[0] !== steps) return void 0;
  const o = recurrent3.sequence ? shapes.output.position[0] : steps - 1;
  const chains = [{ from: 0, to: o, backward: false }];
  if (recurrent3.bidirectional) chains.push({ from: recurrent3.sequence ? o : 0, to: steps - 1, backward: true });
  return { layer: recurrent3, m, steps, chains };
}
function sideSizes(side) {
  let a = 0;
  for (const x of side) a += x;
  return [a, side.length - a];
}
function sameMask(a, b) {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

// src/config/exact-number.ts
var EXACT_LIMIT = 1n << 63n;
var OverflowError = class extends Error {
  name = "OverflowError";
};
function gcd(a, b) {
  let x = a < 0n ? -a : a;
  let y = b < 0n ? -b : b;
  while (y !== 0n) [x, y] = [y, x % y];
  return x;
}
function exact(n, d = 1n) {
  if (d === 0n) throw new RangeError("exact: zero denominator");
  if (d < 0n) [n, d] = [-n, -d];
  const g = gcd(n, d) || 1n;
  const out = { n: n / g, d: d / g };
  if (out.n >= EXACT_LIMIT || out.n <= -EXACT_LIMIT || out.d >= EXACT_LIMIT) throw new OverflowError(`${show(out)} is beyond 2^63`);
  return out;
}
function show(x) {
  const text = x.d === 1n ? x.n.toString() : `${x.n}/${x.d}`;
  return text.length > 40 ? `a number of ${text.length} digits` : text;
}
var ZERO3 = { n: 0n, d: 1n };
function add(a, b) {
  return exact(a.n * b.d + b.n * a.d, a.d * b.d);
}
function sub(a, b) {
  return exact(a.n * b.d - b.n * a.d, a.d * b.d);
}
function mul(a, b) {
  return exact(a.n * b.n, a.d * b.d);
}
function div(a, b) {
  return exact(a.n * b.d, a.d * b.n);
}
function neg(a) {
  return { n: -a.n, d: a.d };
}
function isZero(a) {
  return a.n === 0n;
}
function isInteger(a) {
  return a.d === 1n;
}
function compare(a, b) {
  const l = a.n * b.d;
  const r = b.n * a.d;
  return l < r ? -1 : l > r ? 1 : 0;
}
function floor(a) {
  const q = a.n / a.d;
  return { n: a.n < 0n && q * a.d !== a.n ? q - 1n : q, d: 1n };
}
function ceil(a) {
  const q = a.n / a.d;
  return { n: a.n > 0n && q * a.d !== a.n ? q + 1n : q, d: 1n };
}
function pow(a, k) {
  if (k < 0 && a.n === 0n) throw new RangeError("zero to a negative power");
  let out = { n: 1n, d: 1n };
  const base = k < 0 ? div({ n: 1n, d: 1n }, a) : a;
  for (let i = 0; i < Math.abs(k); i++) out = mul(out, base);
  return out;
}
function parseDecimal(text) {
  const m = /^([+-]?)([0-9]+)(?:\.([0-9]*))?(?:[eE]([+-]?[0-9]+))?$/.exec(text) ?? /^([+-]?)()\.([0-9]+)(?:[eE]([+-]?[0-9]+))?$/.exec(text);
  if (!m) return void 0;
  const digits = `${m[2] ?? ""}${m[3] ?? ""}`.replace(/^0+(?=[0-9])/, "") || "0";
  const exponent = Number(m[4] ?? "0") - (m[3] ?? "").length;
  if (!Number.isSafeInteger(exponent) || Math.abs(exponent) > 400 || digits.length > 400) {
    if (/^0*$/.test(digits)) return ZERO3;
    throw new OverflowError(`${text} is beyond 2^63`);
  }
  const n = BigInt(digits) * (m[1] === "-" ? -1n : 1n);
  return exponent >= 0 ? exact(n * 10n ** BigInt(exponent), 1n) : exact(n, 10n ** BigInt(-exponent));
}
function fromNumber(x) {
  if (!Number.isFinite(x)) return void 0;
  return parseDecimal(String(x));
}
function toNumber(a) {
  if (a.d === 1n) return Number(a.n);
  return Number(a.n) / Number(a.d);
}
function formatExact(a) {
  if (a.d === 1n) return a.n.toString();
  let d = a.d;
  let twos = 0;
  let fives = 0;
  while (d % 2n === 0n) [d, twos] = [d / 2n, twos + 1];
  while (d % 5n === 0n) [d, fives] = [d / 5n, fives + 1];
  if (d !== 1n) return `${a.n}/${a.d}`;
  const places = Math.max(twos, fives);
  const scaled = a.n * 10n ** BigInt(places) / a.d;
  const negative = scaled < 0n;
  const digits = (negative ? -scaled : scaled).toString().padStart(places + 1, "0");
  return `${negative ? "-" : ""}${digits.slice(0, -places)}.${digits.slice(-places)}`;
}

// src/policy/parameters.ts
var AFFINE_NORMS = /* @__PURE__ */ new Set(["batch_norm", "layer_norm", "group_norm", "instance_norm"]);
var GATES = { arithmetic: 1, rnn: 1, lstm: 4, gru: 3 };
function parameterCount(model) {
  const inferred = inferShapes(model);
  if (!inferred.ok) throw new Error(`parameter count: the shapes of ${model.file} do not infer: ${inferred.diagnostics[0]?.message ?? ""}`);
  const shapes = inferred.shapes;
  const inputWidth = model.input.channels ?? shapes.representation;
  const widths = [];
  const width = (i) => i === INPUT ? inputWidth : widths[i];
  const grid = (i) => i === INPUT ? model.input.shape : shapes.layers[i].shape;
  let total = 0n;
  for (const layer of model.layers) {
    const d = width(layer.inputs[0]);
    const w = outWidth(layer, d, layer.inputs.map(width), grid(layer.inputs[0]));
    widths.push(w);
    total += countOf(layer, d, w, model, shapes, grid(layer.inputs[0]));
  }
  return total;
}
function outWidth(layer, d, ins, inGrid) {
  if (layer.kind === "recurrent") return layer.bidirectional && layer.merge === "concat" ? 2 * layer.hidden : layer.hidden;
  const own = layerWidth(layer);
  if (own !== void 0) return own;
  switch (layer.kind) {
    case "conv":
      return layer.groups === "depthwise" ? d * layer.depthMultiplier : d;
    case "flatten":
      return d * positionCount(inGrid);
    case "merge":
      return layer.mode === "sum" ? d : ins.reduce((a, b) => a + b, 0);
    default:
      return d;
  }
}
function countOf(layer, d, w, model, shapes, inGrid) {
  const outPositions = BigInt(positionCount(shapes.layers[layer.index].shape));
  const copies = (perPosition, positions) => model.weightSharing ? perPosition : perPosition * positions;
  const bias = (b) => b.bias === false ? 0n : BigInt(w);
  switch (layer.kind) {
    case "conv": {
      const groups = layer.groups === "depthwise" ? d : layer.groups;
      const taps = BigInt(layer.kernel.reduce((a, b) => a * b, 1));
      return copies(taps * BigInt(Math.ceil(d / groups)) * BigInt(w) + bias(layer), outPositions);
    }
    case "conv-transpose": {
      const taps = BigInt(layer.kernel.reduce((a, b) => a * b, 1));
      return copies(taps * BigInt(Math.ceil(d / layer.groups)) * BigInt(w) + bias(layer), outPositions);
    }
    case "dense": {
      const reading = shapes.denseReading[layer.index];
      const inWidth = reading === "input" ? d * positionCount(inGrid) : d;
      const one = BigInt(inWidth) * BigInt(w) + bias(layer);
      return reading === "per-position" ? copies(one, outPositions) : one;
    }
    case "recurrent": {
      const g = BigInt(GATES[layer.cell]);
      const h = BigInt(layer.hidden);
      const directions = layer.bidirectional ? 2n : 1n;
      const below = BigInt(layer.bidirectional && layer.merge === "concat" ? 2 * layer.hidden : layer.hidden);
      let total = 0n;
      for (let l = 0; l < layer.depth; l++) total += directions * (g * (h * (l === 0 ? BigInt(d) : below) + h * h) + (layer.bias === false ? 0n : g * h));
      return total;
    }
    case "embedding":
      return BigInt(d) * BigInt(layer.dim);
    case "position":
      return layer.mode === "learned" ? BigInt(positionCount(inGrid)) * BigInt(d) : 0n;
    case "class-token":
      return BigInt(d);
    case "attention": {
      const inner = BigInt(layer.heads) * BigInt(shapes.headDims[layer.index]);
      const weights = 4n * BigInt(d) * inner;
      return layer.bias === false ? weights : weights + 3n * inner + BigInt(d);
    }
    case "pointwise":
      if (AFFINE_NORMS.has(layer.op)) return 2n * BigInt(d);
      if (layer.op === "rms_norm" || layer.op === "prelu") return BigInt(d);
      return 0n;
    default:
      return 0n;
  }
}

// src/policy/parameter-fixes.ts
var MAX_GRID = 1 << 20;
var MAX_SEARCHED_PARAMETERS = 32;
function searchParameterFixes(model, space, near, inputCut, restoring, minRank) {
  const fed = /* @__PURE__ */ new Set();
  for (const i of near) for (const uses of Object.values(model.layers[i].fieldParams ?? {})) for (const u of uses) fed.add(u.name);
  if (inputCut) for (const uses of Object.values(model.input.fieldParams ?? {})) for (const u of uses) fed.add(u.name);
  const baseParams = parameterCount(model);
  const fixes = [];
  for (const choice of space.choices.filter((c) => fed.has(c.name)).slice(0, MAX_SEARCHED_PARAMETERS)) {
    const found = smallestRestoring(choice, space, restoring);
    if (!found) continue;
    fixes.push({
      layer: "parameter",
      field: choice.label,
      line: choice.span.line,
      column: choice.span.column,
      ...choice.set ? {} : { added: true },
      from: toNumber(choice.value),
      to: toNumber(found.value),
      addedParameters: parameterCount(found.model) - baseParams,
      verdict: found.bounds.lower !== null && found.bounds.lower.rank >= minRank ? "pass" : "unproven"
    });
  }
  return fixes;
}
function smallestRestoring(choice, space, restoring) {
  const step = choice.step;
  const first = floor(div(choice.value, step)).n + 1n;
  const last = floor(div(choice.max, step)).n;
  if (first > last || last - first > BigInt(MAX_GRID)) return void 0;
  const at = (k) => {
    const value = mul({ n: k, d: 1n }, step);
    const m = space.withValue(choice, value);
    const b = m && restoring(m);
    return m && b ? { value, model: m, bounds: b } : void 0;
  };
  let lo = first - 1n;
  let hi = first;
  let found;
  for (let gap = 1n; ; gap *= 2n) {
    found = at(hi);
    if (found) break;
    if (hi >= last) return void 0;
    lo = hi;
    hi = hi + gap > last ? last : hi + gap;
  }
  while (hi - lo > 1n) {
    const mid = (lo + hi) / 2n;
    const f2 = at(mid);
    if (f2) [hi, found] = [mid, f2];
    else lo = mid;
  }
  return found;
}

// src/policy/fix-search.ts
function restores(b, minRank, unproven) {
  if (b.upper.rank < minRank) return false;
  return unproven === "warn" || b.lower !== null && b.lower.rank >= minRank;
}
var MAX_WIDTH2 = 1 << 16;
var MAX_DEPTH = 64;
function searchFixes(model, partition, minRank, unproven, surrogate, cutLayers, parameters) {
  const probing = minRank <= BigInt(MAX_PROBES);
  const judge = (m, probe) => {
    const a = analyseLayered(m, { surrogate, ...probe && probing ? {} : { probeBudget: 0 } });
    if (!a.ok) return void 0;
    const b = a.bounds(partition, probe && probing ? minRank : null);
    return "diagnostic" in b ? void 0 : b;
  };
  const near = nearLayers(model, cutLayers);
  const restoring = (m) => {
    const b = judge(m, true);
    return b && restores(b, minRank, unproven) ? b : void 0;
  };
  const byParameter = parameters ? searchParameterFixes(model, parameters, near, cutLayers.has("input"), restoring, minRank) : [];
  const baseParams = parameterCount(model);
  const fixes = [];
  const file = model.architecture ? { file: model.architecture.path } : {};
  for (const cand of candidates(model, near)) {
    const reaches = (v) => {
      const b = judge(cand.apply(model, v), false);
      return b !== void 0 && b.upper.rank >= minRank;
    };
    const ceiling = reaches(cand.from) ? cand.from : smallest2(cand.from, cand.max, reaches);
    if (ceiling === void 0) continue;
    let to = ceiling;
    let found = judge(cand.apply(model, to), true);
    if (unproven === "fail" && !(found && restores(found, minRank, "fail"))) {
      const proven = smallest2(ceiling, cand.max, (v) => {
        const b = judge(cand.apply(model, v), true);
        return b !== void 0 && restores(b, minRank, "fail");
      });
      if (proven === void 0) continue;
      to = proven;
      found = judge(cand.apply(model, to), true);
    }
    if (!found || to === cand.from) continue;
    const fixed = cand.apply(model, to);
    const pass = found.lower !== null && found.lower.rank >= minRank;
    fixes.push({
      layer: cand.layer,
      field: cand.field,
      line: cand.span.line,
      column: cand.span.column,
      ...file,
      from: cand.from,
      to,
      addedParameters: parameterCount(fixed) - baseParams,
      verdict: pass ? "pass" : "unproven",
      ...pass ? { rule: found.lower.method } : {}
    });
  }
  return [...cheapestFirst(byParameter), ...cheapestFirst(fixes)];
}
function cheapestFirst(fixes) {
  return [...fixes].sort((a, b) => a.addedParameters < b.addedParameters ? -1 : a.addedParameters > b.addedParameters ? 1 : a.line - b.line);
}
function smallest2(from, max, ok) {
  let lo = from;
  let hi = Math.min(max, Math.max(from + 1, from * 2));
  for (; ; ) {
    if (ok(hi)) break;
    if (hi >= max) return void 0;
    lo = hi;
    hi = Math.min(max, hi * 2);
  }
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
}
function nearLayers(model, cutLayers) {
  const near = /* @__PURE__ */ new Set();
  const consumers = model.layers.map(() => []);
  for (const l of model.layers) for (const i of l.inputs) if (i !== INPUT) consumers[i].push(l.index);
  for (const l of model.layers) {
    if (!cutLayers.has(layerLabel(l))) continue;
    near.add(l.index);
    for (const i of l.inputs) if (i !== INPUT) near.add(i);
    for (const c of consumers[l.index]) near.add(c);
  }
  if (cutLayers.has("input") && model.input.representation === void 0) for (const l of firstMaps(model)) near.add(l.index);
  return near;
}
function candidates(model, near) {
  const seen = /* @__PURE__ */ new Set();
  const out = [];
  for (const i of [...near].sort((a, b) => a - b)) {
    const layer = model.layers[i];
    for (const field of widthFields(layer)) {
      const key = `${layer.path}#${field}`;
      if (seen.has(key)) continue;
      seen.add(key);
      out.push({
        layer: layerLabel(layer),
        field,
        span: layer.fieldSpans[field] ?? layer.span,
        from: fieldValue(layer, field),
        max: field === "depth" ? MAX_DEPTH : MAX_WIDTH2,
        apply: (m, v) => ({ ...m, layers: m.layers.map((l) => l.path === layer.path ? withField(l, field, v) : l) })
      });
    }
  }
  return out;
}
function widthFields(layer) {
  switch (layer.kind) {
    case "conv":
      return layer.channels === void 0 ? [] : ["channels"];
    case "conv-transpose":
      return ["channels"];
    case "dense":
      return ["units"];
    case "recurrent":
      return ["hidden", "depth"];
    default:
      return [];
  }
}
function fieldValue(layer, field) {
  return layer[field];
}
function withField(layer, field, value) {
  return { ...layer, [field]: value };
}

// src/policy/policy.ts
function maxDropBitsOf(r, p) {
  return r.maxDropBits ?? p.maxDropBits;
}

// src/policy/evaluate.ts
function verdictOf(b, minRank) {
  if (b.upper.rank < minRank) return "fail";
  if (b.lower !== null && b.lower.rank >= minRank) return "pass";
  return "unproven";
}
function evaluatePolicy(model, policy, options = {}) {
  const shape = model.kind === "explicit" ? model.shape : model.input.shape;
  const partitions = [];
  const diagnostics = [];
  for (const req of policy.requirements) {
    const spec = policy.partitions.get(req.partition)?.spec ?? req.partition;
    const r = resolvePartition(spec, shape);
    if (r.ok) partitions.push({ ...r.partition, label: req.partition });
    else {
      diagnostics.push({
        code: "policy/partition-does-not-fit",
        message: `requirement on '${req.partition}' cannot be checked for ${model.file}: ${r.message}`,
        file: req.file,
        span: req.span,
        severity: "error"
      });
    }
  }
  if (diagnostics.length > 0) return { ok: false, diagnostics };
  const surrogate = policy.surrogate;
  const probeTargets = policy.requirements.map((r) => maxDropBitsOf(r, policy) === void 0 ? r.minRank : void 0);
  const outcome = computeBounds(model, partitions, { surrogate, probeTargets });
  if (!outcome.ok) return outcome;
  const wantFixes = options.fixes ?? true;
  const requirements = policy.requirements.map((req, i) => {
    const bounds = outcome.result.partitions[i];
    const verdict = verdictOf(bounds, req.minRank);
    const failing = verdict === "fail" || verdict === "unproven" && req.unproven === "fail";
    const fixes = failing && wantFixes && model.kind === "layered" ? searchFixes(model, partitions[i], req.minRank, req.unproven, surrogate, new Set(bounds.upper.cut.map((c) => c.layer)), options.parameters) : [];
    return { requirement: req, partition: partitions[i], bounds, verdict, failing, fixes };
  });
  return {
    ok: true,
    result: {
      file: model.file,
      policy,
      surrogate,
      verdict: requirements.some((r) => r.failing) ? "fail" : "pass",
      requirements,
      notes: outcome.result.notes
    }
  };
}

// src/config/load-config.ts
var import_yaml7 = __toESM(require_dist(), 1);

// src/config/located-value.ts
var import_yaml2 = __toESM(require_dist(), 1);

// src/config/anchor-index.ts
var import_yaml = __toESM(require_dist(), 1);
var AnchorIndex = class {
  constructor(doc) {
    this.doc = doc;
  }
  doc;
  byName;
  /** The node of the last `&name` anchor before the alias, as YAML defines it. */
  resolve(alias) {
    const candidates2 = this.index().get(alias.source);
    const at = alias.range?.[0];
    if (!candidates2 || at === void 0) return void 0;
    let found;
    for (const c of candidates2) {
      if (c.offset < at) found = c.node;
      else break;
    }
    return found;
  }
  index() {
    if (this.byName) return this.byName;
    const byName = /* @__PURE__ */ new Map();
    (0, import_yaml.visit)(this.doc, (_key, node) => {
      if (((0, import_yaml.isScalar)(node) || (0, import_yaml.isCollection)(node)) && !(0, import_yaml.isAlias)(node) && node.anchor && node.range) {
        const list2 = byName.get(node.anchor) ?? [];
        list2.push({ offset: node.range[0], node });
        byName.set(node.anchor, list2);
      }
    });
    for (const list2 of byName.values()) list2.sort((a, b) => a.offset - b.offset);
    this.byName = byName;
    return byName;
  }
};

// src/config/field-path.ts
function formatFieldPath(segments, whole = "the model") {
  let out = "";
  for (const s of segments) {
    if (typeof s === "number") out += `[${s}]`;
    else if (/^[A-Za-z_][A-Za-z0-9_-]*$/.test(s)) out += out === "" ? s : `.${s}`;
    else out += `[${JSON.stringify(s)}]`;
  }
  return out === "" ? whole : out;
}

// src/config/json-pointer.ts
function parsePointer(pointer) {
  if (pointer === "") return { ok: true, segments: [] };
  if (!pointer.startsWith("/")) {
    return { ok: false, message: `the model path '${pointer}' is not a JSON pointer: it must be empty or start with '/', e.g. '/model' or '/training/model'` };
  }
  const segments = [];
  for (const raw of pointer.slice(1).split("/")) {
    if (/~(?![01])/.test(raw)) {
      return { ok: false, message: `the model path '${pointer}' has a bad escape in '${raw}': in a JSON pointer '~' must be followed by 0 ('~') or 1 ('/')` };
    }
    segments.push(raw.replace(/~1/g, "/").replace(/~0/g, "~"));
  }
  return { ok: true, segments };
}
function escapeSegment(segment) {
  return String(segment).replace(/~/g, "~0").replace(/\//g, "~1");
}
function formatPointer(segments) {
  return segments.map((s) => "/" + escapeSegment(s)).join("");
}
function isArrayIndex(segment) {
  return /^(0|[1-9][0-9]*)$/.test(segment);
}

// src/config/source-span.ts
function spanFromOffsets(lines, offset, endOffset) {
  const start = lines.linePos(offset);
  const end = lines.linePos(Math.max(offset, endOffset));
  return {
    offset,
    endOffset: Math.max(offset, endOffset),
    line: start.line,
    column: start.col,
    endLine: end.line,
    endColumn: end.col
  };
}
function spanOfRange(lines, range) {
  if (!range) return void 0;
  return spanFromOffsets(lines, range[0], range[1]);
}
function spanJoin(first, last) {
  if (last.endOffset < first.offset) return first;
  return { offset: first.offset, line: first.line, column: first.column, endOffset: last.endOffset, endLine: last.endLine, endColumn: last.endColumn };
}

// src/config/yaml-versions.ts
var BOOL_TRUE = /^(?:y|Y|yes|Yes|YES|true|True|TRUE|on|On|ON)$/;
var BOOL_FALSE = /^(?:n|N|no|No|NO|false|False|FALSE|off|Off|OFF)$/;
var NULL = /^(?:~|null|Null|NULL|)$/;
var INT_BINARY = /^([-+]?)0b([01_]+)$/;
var INT_OCTAL = /^([-+]?)0([0-7_]+)$/;
var INT_DECIMAL = /^[-+]?(?:0|[1-9][0-9_]*)$/;
var INT_HEX = /^([-+]?)0x([0-9a-fA-F_]+)$/;
var SEXAGESIMAL = /^([-+]?)([0-9][0-9_]*(?::[0-5]?[0-9])+)(\.[0-9_]*)?$/;
var FLOAT = /^[-+]?(?:[0-9][0-9_]*\.[0-9_]*|\.[0-9][0-9_]*)(?:[eE][-+][0-9]+)?$/;
var INF = /^([-+]?)\.(?:inf|Inf|INF)$/;
var NAN = /^\.(?:nan|NaN|NAN)$/;
function yaml11Reading(source) {
  if (BOOL_TRUE.test(source)) return true;
  if (BOOL_FALSE.test(source)) return false;
  if (NULL.test(source)) return null;
  let m = INT_BINARY.exec(source);
  if (m) return sign(m[1]) * parseInt(m[2].replace(/_/g, ""), 2);
  m = INT_HEX.exec(source);
  if (m) return sign(m[1]) * parseInt(m[2].replace(/_/g, ""), 16);
  m = INT_OCTAL.exec(source);
  if (m) return sign(m[1]) * parseInt(m[2].replace(/_/g, ""), 8);
  if (INT_DECIMAL.test(source)) return Number(source.replace(/_/g, ""));
  m = SEXAGESIMAL.exec(source);
  if (m && (m[3] !== void 0 || /^[1-9]/.test(m[2]))) {
    let value = 0;
    for (const part of m[2].replace(/_/g, "").split(":")) value = value * 60 + Number(part);
    if (m[3] !== void 0) value += Number(`0${m[3].replace(/_/g, "")}`);
    return sign(m[1]) * value;
  }
  if (FLOAT.test(source)) return Number(source.replace(/_/g, ""));
  m = INF.exec(source);
  if (m) return sign(m[1]) * Infinity;
  if (NAN.test(source)) return NaN;
  return source;
}
function sign(s) {
  return s === "-" ? -1 : 1;
}
function yamlVersionProblem(node, read12) {
  if (node.type !== "PLAIN" || typeof node.source !== "string") return void 0;
  if (node.tag !== void 0) return void 0;
  const read11 = yaml11Reading(node.source);
  if (same(read11, read12)) return void 0;
  const written = node.source.length > 40 ? `${node.source.slice(0, 40)}…` : node.source;
  return `'${written}' reads differently in YAML 1.2 (rankfloor: ${describe(read12)}) and YAML 1.1 (loaders common in training code: ${describe(read11)}); write it so both agree: ${advice(read11, read12)}`;
}
function same(a, b) {
  if (typeof a === "number" && typeof b === "number") return Object.is(a, b) || a === b || Number.isNaN(a) && Number.isNaN(b);
  return a === b;
}
function describe(v) {
  if (v === null) return "null";
  if (typeof v === "boolean") return `the boolean ${v}`;
  if (typeof v === "number") return Number.isInteger(v) ? `the integer ${v}` : `the number ${v}`;
  return `the string ${JSON.stringify(v)}`;
}
function advice(read11, read12) {
  if (typeof read11 === "boolean") return `true or false for a boolean, or quotes for the text ("${String(read12)}")`;
  const numbers = [read11, read12].filter((v) => typeof v === "number" && Number.isFinite(v));
  if (numbers.length > 0) return `the number you mean in plain decimal (${[...new Set(numbers)].join(" or ")}), or quotes for the text`;
  return "quotes for the text, or a plain decimal number";
}

// src/config/located-value.ts
function pathOf(node) {
  const out = [];
  let cur = node;
  let root = node;
  while (cur) {
    if (cur.segment !== void 0) out.push(cur.segment);
    root = cur;
    cur = cur.parent;
  }
  out.reverse();
  return [...root.base ?? [], ...out];
}
function displayPath(node, ...more) {
  let root = node;
  while (root.parent) root = root.parent;
  return formatFieldPath([...pathOf(node), ...more], root.rootName);
}
function pointerOf(node) {
  return formatPointer(pathOf(node));
}
function entryOf(map, key) {
  return map.entries.find((e) => e.key === key);
}
function fieldOf(map, key) {
  return entryOf(map, key)?.value;
}
function locate(root, segments) {
  let cur = root;
  for (const s of segments) {
    if (!cur) return void 0;
    if (cur.kind === "map") cur = fieldOf(cur, s);
    else if (cur.kind === "seq") cur = /^(0|[1-9][0-9]*)$/.test(s) ? cur.items[Number(s)] : void 0;
    else return void 0;
  }
  return cur;
}
function toPlain(node) {
  switch (node.kind) {
    case "scalar":
      return node.value;
    case "seq":
      return node.items.map(toPlain);
    case "map": {
      const out = {};
      for (const e of node.entries) {
        Object.defineProperty(out, e.key, { value: toPlain(e.value), enumerable: true, writable: true, configurable: true });
      }
      return out;
    }
  }
}
function describeValue(node) {
  if (!node) return "nothing";
  if (node.kind === "map") return "a mapping";
  if (node.kind === "seq") return "a list";
  return describeScalar(node.value);
}
function describeScalar(value) {
  if (value === null) return "an empty value";
  if (typeof value === "string") {
    const shown = value.length > 40 ? `${value.slice(0, 40)}…` : value;
    return `the string ${JSON.stringify(shown)}`;
  }
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  if (Array.isArray(value)) return "a list";
  if (typeof value === "object") return "a mapping";
  return String(value);
}
function convertNode(doc, lines, sink, node, base, fallback, naming = {}) {
  const state = {
    anchors: new AnchorIndex(doc),
    rootName: naming.rootName ?? "the model",
    subject: naming.subject ?? "architecture",
    lines,
    sink,
    expansions: 0,
    active: /* @__PURE__ */ new Set(),
    failed: false,
    reportedBudget: false,
    reportedDepth: false
  };
  const root = convert(state, node, void 0, void 0, fallback, 0, base, void 0, naming.rootName);
  return state.failed ? void 0 : root;
}
function convert(st, node, parent, segment, fallback, depth, base, aliasSpan, rootName) {
  const common = (own) => ({
    span: aliasSpan ?? own ?? fallback,
    parent,
    segment,
    ...base ? { base } : {},
    ...rootName !== void 0 ? { rootName } : {}
  });
  if (depth > MAX_NESTING_DEPTH) {
    if (!st.reportedDepth) {
      st.reportedDepth = true;
      st.sink.error("config/too-deep", `${st.rootName} is nested more than ${MAX_NESTING_DEPTH} levels deep here; no ${st.subject} needs that`, aliasSpan ?? fallback);
    }
    st.failed = true;
    return void 0;
  }
  if (node === null || node === void 0) {
    return { kind: "scalar", value: null, ...common(void 0) };
  }
  if ((0, import_yaml2.isAlias)(node)) {
    const own = spanOfRange(st.lines, node.range) ?? fallback;
    st.expansions += 1;
    if (st.expansions > MAX_ALIAS_EXPANSIONS) {
      if (!st.reportedBudget) {
        st.reportedBudget = true;
        st.sink.error(
          "config/alias-limit",
          `too many alias expansions: ${st.rootName} expands more than ${MAX_ALIAS_EXPANSIONS} aliases (*${node.source}); a document that multiplies itself through aliases is refused`,
          own
        );
      }
      st.failed = true;
      return void 0;
    }
    const target = st.anchors.resolve(node);
    if (!target) {
      st.sink.error("config/yaml", `the alias *${node.source} refers to no anchor &${node.source} before it`, own);
      st.failed = true;
      return void 0;
    }
    if (st.active.has(target)) {
      st.sink.error("config/alias-cycle", `the alias *${node.source} is inside its own anchor &${node.source}, which would make the value infinite`, own);
      st.failed = true;
      return void 0;
    }
    st.active.add(target);
    try {
      return convert(st, target, parent, segment, own, depth + 1, base, aliasSpan ?? own, rootName);
    } finally {
      st.active.delete(target);
    }
  }
  if ((0, import_yaml2.isScalar)(node)) {
    const own = spanOfRange(st.lines, node.range);
    const v = node.value;
    if (v === null || typeof v === "string" || typeof v === "number" || typeof v === "boolean") {
      const versions = yamlVersionProblem(node, v);
      if (versions) st.sink.error("config/yaml-version", versions, aliasSpan ?? own ?? fallback);
      return { kind: "scalar", value: v, ...common(own) };
    }
    st.sink.error("config/type", `this value (${typeof v}) is not a plain string, number, boolean or null`, aliasSpan ?? own ?? fallback);
    st.failed = true;
    return void 0;
  }
  if ((0, import_yaml2.isSeq)(node)) {
    const own = spanOfRange(st.lines, node.range);
    const seq = { kind: "seq", items: [], ...common(own) };
    node.items.forEach((item, i) => {
      const child = convert(st, item, seq, i, seq.span, depth + 1);
      if (child) seq.items.push(child);
    });
    return seq;
  }
  if ((0, import_yaml2.isMap)(node)) {
    const own = spanOfRange(st.lines, node.range);
    const map = { kind: "map", entries: [], ...common(own) };
    const firstAt = /* @__PURE__ */ new Map();
    for (const pair of node.items) {
      const keyNode = (0, import_yaml2.isAlias)(pair.key) ? st.anchors.resolve(pair.key) : pair.key;
      const keySpan = ((0, import_yaml2.isAlias)(pair.key) || (0, import_yaml2.isScalar)(pair.key) || (0, import_yaml2.isMap)(pair.key) || (0, import_yaml2.isSeq)(pair.key) ? spanOfRange(st.lines, pair.key.range) : void 0) ?? map.span;
      if (!(0, import_yaml2.isScalar)(keyNode) || keyNode.value !== null && typeof keyNode.value === "object") {
        st.sink.error("config/key-type", `${formatFieldPath(pathOf(map), st.rootName)} has a key that is not a plain name; keys must be strings such as 'layers'`, keySpan);
        st.failed = true;
        continue;
      }
      const key = String(keyNode.value);
      const earlier = firstAt.get(key);
      if (earlier) {
        st.sink.error("config/duplicate-key", `${formatFieldPath([...pathOf(map), key], st.rootName)} is given twice (first on line ${earlier.line}); keep one`, keySpan);
        st.failed = true;
        continue;
      }
      firstAt.set(key, keySpan);
      const valueFallback = spanFromOffsets(st.lines, keySpan.endOffset, keySpan.endOffset);
      const value = convert(st, pair.value, map, key, valueFallback, depth + 1);
      if (value) map.entries.push({ key, writtenKey: key, keySpan, value });
    }
    return map;
  }
  st.sink.error("config/type", "this YAML node is not a mapping, list or scalar", aliasSpan ?? fallback);
  st.failed = true;
  return void 0;
}

// src/config/located-read.ts
function asMap(node) {
  return node?.kind === "map" ? node : void 0;
}
function positiveIntegerOf(node) {
  return node?.kind === "scalar" && typeof node.value === "number" && Number.isSafeInteger(node.value) && node.value >= 1 ? node.value : void 0;
}
function nonNegativeIntegerOf(node) {
  return node?.kind === "scalar" && typeof node.value === "number" && Number.isSafeInteger(node.value) && node.value >= 0 ? node.value : void 0;
}
function stringOf(node) {
  return node?.kind === "scalar" && typeof node.value === "string" ? node.value : void 0;
}
function booleanOf(node) {
  return node?.kind === "scalar" && typeof node.value === "boolean" ? node.value : void 0;
}
function positiveIntegerListOf(node) {
  if (node?.kind !== "seq") return void 0;
  const out = [];
  for (const item of node.items) {
    const n = positiveIntegerOf(item);
    if (n === void 0) return void 0;
    out.push(n);
  }
  return out;
}
function fieldSpansOf(body, fields) {
  const out = {};
  for (const f2 of fields) {
    const v = fieldOf(body, f2);
    if (v) out[f2] = v.span;
  }
  return out;
}

// src/config/build-explicit.ts
var LISTED_POSITIONS = 10;
function buildExplicitModel(root, file, sink) {
  const network = asMap(fieldOf(root, "network"));
  if (!network) return void 0;
  const shapeNode = fieldOf(network, "shape");
  const shape = positiveIntegerListOf(shapeNode);
  const validShape = shape && shape.length >= 1 && shape.length <= 2 ? shape : void 0;
  const positions = validShape ? positionCount(validShape) : void 0;
  let ok = validShape !== void 0;
  const tensors = [];
  const firstByName = /* @__PURE__ */ new Map();
  const tensorsNode = fieldOf(network, "tensors");
  const covered = /* @__PURE__ */ new Set();
  for (const item of tensorsNode?.kind === "seq" ? tensorsNode.items : []) {
    const tensor = asMap(item);
    const nameNode = tensor ? fieldOf(tensor, "name") : void 0;
    const name = stringOf(nameNode);
    if (!tensor || name === void 0 || name === "" || !nameNode) {
      ok = false;
      continue;
    }
    const earlier = firstByName.get(name);
    if (earlier) {
      sink.error("config/duplicate-tensor", `${displayPath(nameNode)} is '${name}', which ${displayPath(earlier)} (line ${earlier.span.line}) already names; tensor names must be unique`, nameNode.span);
      ok = false;
    } else {
      firstByName.set(name, nameNode);
    }
    const legs = [];
    const legsNode = fieldOf(tensor, "legs");
    if (legsNode !== void 0 && legsNode.kind !== "seq") ok = false;
    for (const legItem of legsNode?.kind === "seq" ? legsNode.items : []) {
      const leg = asMap(legItem);
      const positionNode = leg ? fieldOf(leg, "position") : void 0;
      const position = nonNegativeIntegerOf(positionNode);
      const dim = positiveIntegerOf(leg ? fieldOf(leg, "dim") : void 0);
      if (!leg || position === void 0 || dim === void 0 || !positionNode) {
        ok = false;
        continue;
      }
      if (positions !== void 0 && position >= positions) {
        sink.error(
          "config/position-out-of-range",
          `${displayPath(positionNode)} is ${position}, but the shape [${validShape.join(", ")}] has positions 0 to ${positions - 1} (numbered row-major)`,
          positionNode.span
        );
        ok = false;
        continue;
      }
      covered.add(position);
      legs.push({ position, dim, span: leg.span });
    }
    tensors.push({ name, legs, span: tensor.span });
  }
  if (tensorsNode?.kind !== "seq" || tensorsNode.items.length === 0) ok = false;
  const bonds = [];
  const bondsNode = fieldOf(network, "bonds");
  if (bondsNode !== void 0 && bondsNode.kind !== "seq") ok = false;
  const names = [...firstByName.keys()];
  for (const item of bondsNode?.kind === "seq" ? bondsNode.items : []) {
    const bond = asMap(item);
    const betweenNode = bond ? fieldOf(bond, "between") : void 0;
    const dim = positiveIntegerOf(bond ? fieldOf(bond, "dim") : void 0);
    if (!bond || betweenNode?.kind !== "seq" || betweenNode.items.length < 2 || dim === void 0) {
      ok = false;
      continue;
    }
    const members = [];
    for (const member of betweenNode.items) {
      const ref = stringOf(member);
      if (ref === void 0 || ref === "") {
        ok = false;
        continue;
      }
      if (!firstByName.has(ref)) {
        const guess = closest(ref, names);
        sink.error(
          "config/unknown-tensor",
          `${displayPath(member)} names the tensor '${ref}', which is not in network.tensors${guess ? ` (did you mean '${guess}'?)` : ""}`,
          member.span
        );
        ok = false;
      } else if (members.includes(ref)) {
        sink.error("config/duplicate-bond-tensor", `${displayPath(member)} repeats '${ref}'; a bond joins different tensors`, member.span);
        ok = false;
      }
      members.push(ref);
    }
    bonds.push({ tensors: members, dim, span: bond.span });
  }
  if (positions !== void 0 && shapeNode) {
    const bare = [];
    for (let p = 0; p < positions && bare.length <= LISTED_POSITIONS; p++) if (!covered.has(p)) bare.push(p);
    if (bare.length > 0) {
      const missing = positions - covered.size;
      const listed = bare.slice(0, LISTED_POSITIONS).join(", ");
      const more = missing > LISTED_POSITIONS ? ` and ${missing - LISTED_POSITIONS} more` : "";
      sink.error(
        "config/position-without-leg",
        `${missing === 1 ? "position" : "positions"} ${listed}${more} of ${displayPath(shapeNode)} [${validShape.join(", ")}] ${missing === 1 ? "has" : "have"} no open leg; every input position needs a tensor with a leg there`,
        shapeNode.span
      );
      ok = false;
    }
  }
  if (!ok || !validShape) return void 0;
  return { kind: "explicit", file, shape: validShape, tensors, bonds, span: root.span };
}

// src/config/pointwise-ops.ts
var ops = (family, rows) => rows.map(([op, ...aliases]) => ({ op, family, aliases }));
var POINTWISE_OPS = [
  ...ops("activation", [
    ["relu"],
    ["relu6"],
    ["gelu"],
    ["silu", "swish"],
    ["tanh"],
    ["sigmoid"],
    ["hard_sigmoid"],
    ["elu"],
    ["selu"],
    ["celu"],
    ["leaky_relu", "lrelu"],
    ["softplus"],
    ["softsign"],
    ["mish"],
    ["hardswish", "hswish", "hard_swish"],
    ["hardtanh"],
    ["prelu"],
    ["softmax"],
    ["log_softmax"],
    ["identity"]
  ]),
  ...ops("normalisation", [
    ["batch_norm", "bn", "batchnormalization", "syncbatchnorm"],
    ["layer_norm", "ln", "layernormalization"],
    ["group_norm", "gn", "groupnormalization"],
    ["instance_norm", "instancenormalization"],
    ["local_response_norm", "lrn", "localresponsenormalization"],
    ["rms_norm", "rmsnormalization"]
  ]),
  ...ops("dropout", [
    ["dropout"],
    ["spatial_dropout"],
    ["alpha_dropout"],
    ["gaussian_dropout"],
    ["feature_alpha_dropout"]
  ]),
  ...ops("scaling", [
    ["scale", "scaling", "rescaling"],
    ["weight_norm", "weightnormalization"]
  ])
];
function normaliseWord(word) {
  return word.toLowerCase().replace(/[_\-\s.]/g, "");
}
var BY_WORD = /* @__PURE__ */ new Map();
for (const o of POINTWISE_OPS) for (const w of [o.op, ...o.aliases]) BY_WORD.set(normaliseWord(w), o);
function pointwiseOpOf(normalisedWord) {
  return BY_WORD.get(normalisedWord);
}
function opsOf(family) {
  return POINTWISE_OPS.filter((o) => o.family === family).map((o) => o.op);
}

// src/config/read-input.ts
function readInput(node, sink, paramsOf) {
  if (!node) return void 0;
  const shapeNode = fieldOf(node, "shape");
  const given = positiveIntegerListOf(shapeNode);
  const channelsNode = fieldOf(node, "channels");
  const channels = positiveIntegerOf(channelsNode);
  const reprNode = fieldOf(node, "representation");
  const representation = positiveIntegerOf(reprNode);
  const vocabNode = fieldOf(node, "vocabulary");
  const vocabulary = positiveIntegerOf(vocabNode);
  if (!shapeNode || !given || given.length < 1 || given.length > 3) return void 0;
  if (channelsNode && channels === void 0 || reprNode && representation === void 0 || vocabNode && vocabulary === void 0) return void 0;
  if (vocabulary !== void 0 && !tokenFieldsAgree(node, sink)) return void 0;
  let shape = given;
  if (given.length === 3) {
    const at = displayPath(shapeNode);
    const text = `[${given.join(", ")}]`;
    if (channels === void 0) {
      sink.error(
        "config/input-shape",
        `${at} is ${text}: only 1D ([length]) and 2D ([height, width]) grids are supported; if one entry is the channel count, give it as input.channels too (e.g. channels: ${Math.min(given[0], given[2])}) and it is dropped, or write the shape without it`,
        shapeNode.span
      );
      return void 0;
    }
    const first = given[0] === channels ? given.slice(1) : void 0;
    const last = given[2] === channels ? given.slice(0, 2) : void 0;
    if (first && last && (first[0] !== last[0] || first[1] !== last[1])) {
      sink.error("config/input-shape", `${at} is ${text}, and both its first and its last entry equal input.channels (${channels}); write [height, width]`, shapeNode.span);
      return void 0;
    }
    const kept = first ?? last;
    if (!kept) {
      sink.error(
        "config/input-shape",
        `${at} is ${text}, but neither its first nor its last entry equals input.channels (${channels}); write [height, width] (only 1D and 2D grids are supported)`,
        shapeNode.span
      );
      return void 0;
    }
    shape = kept;
  }
  const fieldParams = {};
  for (const [field, value] of [["shape", shapeNode], ["channels", channelsNode], ["representation", reprNode]]) {
    const used = value && paramsOf ? paramsOf(value) : [];
    if (used.length > 0) fieldParams[field] = used;
  }
  const written = entryOf(node, "channels")?.writtenKey;
  const featuresAsChannels = written !== void 0 && normaliseWord(written) === "features";
  return {
    shape,
    ...representation !== void 0 ? { representation } : {},
    ...channels !== void 0 ? { channels } : {},
    ...vocabulary !== void 0 ? { vocabulary } : {},
    ...featuresAsChannels ? { featuresAsChannels: true } : {},
    span: node.span,
    fieldSpans: fieldSpansOf(node, ["shape", "representation", "channels", "vocabulary"]),
    ...Object.keys(fieldParams).length > 0 ? { fieldParams } : {}
  };
}
function tokenFieldsAgree(node, sink) {
  const vocab = entryOf(node, "vocabulary").writtenKey;
  let ok = true;
  for (const [field, why] of [
    ["representation", "a token position supports exactly its V indicator functions, so M = V"],
    ["channels", "a token position holds one token, not channels"]
  ]) {
    const entry = entryOf(node, field);
    if (!entry) continue;
    sink.error("config/conflicting-fields", `${displayPath(node)} gives both '${vocab}' and '${entry.writtenKey}': ${why}; drop '${entry.writtenKey}'`, entry.keySpan);
    ok = false;
  }
  return ok;
}
function readOutput(node) {
  if (!node) return {};
  const p = fieldOf(node, "position");
  if (!p) return { span: node.span };
  const one = nonNegativeIntegerOf(p);
  const list2 = p.kind === "seq" ? p.items.map(nonNegativeIntegerOf) : void 0;
  if (one !== void 0) return { position: [one], span: p.span };
  if (list2 && list2.every((v) => v !== void 0)) return { position: list2, span: p.span };
  return void 0;
}

// src/config/field-readers.ts
function isInteger2(node) {
  return node.kind === "scalar" && typeof node.value === "number" && Number.isSafeInteger(node.value);
}
function wrong(node, ctx, what, numeric) {
  const isNumber = node.kind === "scalar" && typeof node.value === "number";
  const code = numeric && isNumber ? "config/invalid-number" : "config/type";
  ctx.sink.error(code, `${displayPath(node)} must be ${what}, got ${describeValue(node)}`, node.span);
  return void 0;
}
function readPositiveInteger(node, ctx) {
  return isInteger2(node) && node.value >= 1 ? node.value : wrong(node, ctx, "a positive integer", true);
}
function readNonNegativeInteger(node, ctx) {
  return isInteger2(node) && node.value >= 0 ? node.value : wrong(node, ctx, "a non-negative integer", true);
}
function readPerAxis(node, ctx, min = 1) {
  const one = min === 1 ? readPositiveInteger : readNonNegativeInteger;
  const noun = min === 1 ? "positive integer" : "non-negative integer";
  if (node.kind === "scalar" && typeof node.value === "number") {
    const v = one(node, ctx);
    return v === void 0 || ctx.dims === void 0 ? void 0 : new Array(ctx.dims).fill(v);
  }
  if (node.kind !== "seq") {
    const form = ctx.dims === 1 ? "[n]" : "[height, width]";
    return wrong(node, ctx, `a ${noun} or a list ${form}`, false);
  }
  const values = node.items.map((item) => one(item, ctx));
  if (values.some((v) => v === void 0) || ctx.dims === void 0) return void 0;
  if (values.length !== ctx.dims) {
    const form = ctx.dims === 1 ? "[n]" : "[height, width]";
    ctx.sink.error(
      "config/dimension-mismatch",
      `${displayPath(node)} has ${values.length} entries, but ${ctx.shapePath} is ${ctx.shapeText} (${ctx.dims}D); give one integer for every axis or ${form}`,
      node.span
    );
    return void 0;
  }
  return values;
}
function readBoolean(node, ctx) {
  return node.kind === "scalar" && typeof node.value === "boolean" ? node.value : wrong(node, ctx, "true or false", false);
}
function readOnly(node, ctx, value, why) {
  const v = readBoolean(node, ctx);
  if (v === void 0) return false;
  if (v === value) return true;
  ctx.sink.error("config/unsupported-value", `${displayPath(node)} is ${String(v)}, which is not read: ${why}`, node.span);
  return false;
}
function readChoice(node, ctx, choices, shown) {
  if (node.kind === "scalar" && typeof node.value === "string") {
    const hit = lookupChoice(node.value, choices);
    if (hit !== void 0) return hit;
    const guess = closest(normaliseWord(node.value), shown.map(normaliseWord));
    const said = guess ? shown.find((s) => normaliseWord(s) === guess) : void 0;
    ctx.sink.error(
      "config/invalid-value",
      `${displayPath(node)} must be one of ${shown.map((s) => `'${s}'`).join(", ")}, got ${describeValue(node)}${said ? ` (did you mean '${said}'?)` : ""}`,
      node.span
    );
    return void 0;
  }
  return wrong(node, ctx, `one of ${shown.map((s) => `'${s}'`).join(", ")}`, false);
}
function lookupChoice(word, choices) {
  const n = normaliseWord(word);
  for (const [k, v] of choices) if (normaliseWord(k) === n) return v;
  return void 0;
}
function readRate(node, ctx) {
  if (node.kind === "scalar" && typeof node.value === "number" && node.value >= 0 && node.value < 1) return node.value;
  return wrong(node, ctx, "a number from 0 up to (not including) 1", true);
}
function readText(node, ctx) {
  if (node.kind === "scalar" && typeof node.value === "string") {
    if (node.value.length > 0) return node.value;
    ctx.sink.error("config/invalid-value", `${displayPath(node)} must be a non-empty string`, node.span);
    return void 0;
  }
  return wrong(node, ctx, "a string", false);
}

// src/config/kind-names.ts
var row = (words, match) => ({ words, match });
var ROWS = [
  row(["conv", "convolution"], { reader: "conv", canonical: "conv" }),
  row(["depthwise_conv", "depthwise_convolution", "dw_conv"], { reader: "conv", canonical: "conv", depthwise: true }),
  row(["separable_conv", "separable_convolution", "sep_conv", "depthwise_separable_conv"], { reader: "separable_conv", canonical: "separable_conv" }),
  row(["conv_transpose", "convolution_transpose", "transposed_conv", "transpose_conv", "deconv", "deconvolution", "upconv"], {
    reader: "conv_transpose",
    canonical: "conv_transpose"
  }),
  row(["pool", "pooling"], { reader: "pool", canonical: "pool" }),
  row(["max_pool", "max_pooling"], { reader: "pool", canonical: "pool", poolMode: "max" }),
  row(["avg_pool", "average_pool", "avg_pooling", "average_pooling", "mean_pool"], { reader: "pool", canonical: "pool", poolMode: "average" }),
  row(["sum_pool", "sum_pooling"], { reader: "pool", canonical: "pool", poolMode: "sum" }),
  row(["product_pool", "product_pooling"], { reader: "pool", canonical: "pool", poolMode: "product" }),
  row(["lp_pool", "lp_pooling"], { reader: "pool", canonical: "pool", poolMode: "other" }),
  row(["global_pool", "global_pooling"], { reader: "pool", canonical: "pool", global: true }),
  row(["global_max_pool", "global_max_pooling"], { reader: "pool", canonical: "pool", global: true, poolMode: "max" }),
  row(["global_avg_pool", "global_average_pool", "global_avg_pooling", "global_average_pooling"], {
    reader: "pool",
    canonical: "pool",
    global: true,
    poolMode: "average"
  }),
  row(["adaptive_avg_pool", "adaptive_average_pool"], { reader: "pool", canonical: "pool", adaptive: true, poolMode: "average" }),
  row(["adaptive_max_pool"], { reader: "pool", canonical: "pool", adaptive: true, poolMode: "max" }),
  row(["dense", "linear", "fc", "fully_connected"], { reader: "dense", canonical: "dense" }),
  row(["flatten"], { reader: "flatten", canonical: "flatten" }),
  row(["upsample", "upsampling", "interpolate"], { reader: "upsample", canonical: "upsample" }),
  row(["upsampling_nearest", "upsample_nearest"], { reader: "upsample", canonical: "upsample", upsampleMode: "nearest" }),
  row(["upsampling_bilinear", "upsample_bilinear"], { reader: "upsample", canonical: "upsample", upsampleMode: "linear" }),
  row(["recurrent"], { reader: "recurrent", canonical: "recurrent", cell: "arithmetic" }),
  row(["rnn", "simple_rnn", "vanilla_rnn", "elman_rnn"], { reader: "recurrent", canonical: "rnn", cell: "rnn" }),
  row(["lstm", "cudnn_lstm"], { reader: "recurrent", canonical: "lstm", cell: "lstm" }),
  row(["gru", "cudnn_gru"], { reader: "recurrent", canonical: "gru", cell: "gru" }),
  row(["embedding", "embed", "embeddings", "token_embedding", "word_embedding"], { reader: "embedding", canonical: "embedding" }),
  row(["position", "position_embedding", "positional_embedding", "pos_embed", "pos_embedding", "learned_position_embedding", "learned_positional_embedding"], {
    reader: "position",
    canonical: "position",
    positionDefault: "learned"
  }),
  row(["positional_encoding", "position_encoding", "pos_encoding"], { reader: "position", canonical: "position", positionDefault: "fixed" }),
  row(["sinusoidal_position_embedding", "sinusoidal_positional_embedding", "sinusoidal_positional_encoding", "sinusoidal_encoding"], {
    reader: "position",
    canonical: "position",
    positionMode: "fixed"
  }),
  row(["class_token", "cls_token", "cls", "class_embedding", "cls_embedding"], { reader: "class_token", canonical: "class_token" }),
  row(["attention", "self_attention", "multi_head_attention", "multihead_attention", "multi_head_self_attention", "mha"], { reader: "attention", canonical: "attention" }),
  row(["causal_self_attention", "causal_attention", "masked_self_attention", "masked_attention", "masked_multi_head_attention"], {
    reader: "attention",
    canonical: "attention",
    causal: true
  }),
  row(["local_attention", "local_self_attention", "sliding_window_attention"], { reader: "attention", canonical: "attention", local: true }),
  row(["transformer_block", "transformer_layer", "transformer_encoder_layer", "transformer_encoder"], {
    reader: "transformer_block",
    canonical: "transformer_block"
  }),
  row(["repeat"], { reader: "repeat", canonical: "repeat" }),
  row(["residual", "residual_block", "res_block"], { reader: "residual", canonical: "residual" }),
  row(["branches", "parallel"], { reader: "branches", canonical: "branches" }),
  row(["add", "sum"], { reader: "add", canonical: "add" }),
  row(["concat", "concatenate", "cat"], { reader: "concat", canonical: "concat" }),
  row(["sequence", "sequential", "block"], { reader: "sequence", canonical: "sequence" }),
  row(["activation"], { reader: "activation", canonical: "activation" }),
  ...POINTWISE_OPS.map((op) => row([op.op, ...op.aliases], { reader: "pointwise", canonical: op.op, op }))
];
var NOT_READ = [
  [
    ["lstm_cell", "gru_cell", "rnn_cell", "simple_rnn_cell"],
    "a single-step cell runs inside a loop that the config does not describe; write the sequence layer (lstm, gru or rnn) with its hidden size and number of layers"
  ],
  [["conv_lstm", "conv_gru"], "convolutional recurrent layers are not read; a recurrent layer reads a 1D sequence of vectors"],
  [
    ["transformer_decoder", "transformer_decoder_layer", "decoder_layer", "cross_attention"],
    "cross-attention reads a second sequence (an encoder's output), which a model with one input does not have; a decoder-only model is a stack of causal blocks: transformer_block with causal: true"
  ],
  [
    ["rotary_embedding", "rotary_position_embedding", "rotary_positional_embedding", "rope", "alibi", "relative_position_bias", "relative_positional_encoding"],
    "rotary and relative position schemes act inside attention (they rotate queries and keys, or bias the scores, per pair of positions), which linearised attention does not model; additive position vectors are read (position, positional_encoding)"
  ],
  [["transformer"], "the name means an encoder-decoder in some frameworks and a stack of encoder blocks in others; write transformer_block (with depth: N for a stack of N)"],
  [["bidirectional"], "write the recurrent layer itself with bidirectional: true (and merge: concat or sum), e.g. lstm: {hidden_size: 64, bidirectional: true}"]
];
var BY_WORD2 = /* @__PURE__ */ new Map();
for (const r of ROWS) for (const w of r.words) BY_WORD2.set(normaliseWord(w), r);
var NOT_READ_WORDS = /* @__PURE__ */ new Map();
for (const [words, why] of NOT_READ) for (const w of words) NOT_READ_WORDS.set(normaliseWord(w), why);
var SUGGESTIONS = /* @__PURE__ */ new Map();
for (const r of ROWS) for (const w of r.words) SUGGESTIONS.set(normaliseWord(w), w);
var KIND_SPELLINGS = ROWS.map((r) => r.words);
function splitDimension(word) {
  const n = normaliseWord(word);
  const m = /([123])d(?=transpose$|$)/.exec(n);
  if (!m) return { base: n, dims3: false };
  return { base: n.slice(0, m.index) + n.slice(m.index + 2), dims3: m[1] === "3" };
}
function lookupKind(written) {
  const { base, dims3 } = splitDimension(written);
  const hit = BY_WORD2.get(base);
  if (hit && dims3) {
    return { ok: false, code: "config/unsupported-3d", message: `'${written}' is a 3D layer; only 1D ([length]) and 2D ([height, width]) grids are supported` };
  }
  if (hit) return { ok: true, match: hit.match };
  const why = NOT_READ_WORDS.get(base);
  if (why !== void 0) return { ok: false, code: "config/unsupported-kind", message: `'${written}' layers are not read: ${why}` };
  const guess = closest(base, [...SUGGESTIONS.keys()]) ?? closest(base.replace(/[123]d/g, ""), [...SUGGESTIONS.keys()]);
  const shown = guess ? SUGGESTIONS.get(guess) : void 0;
  return {
    ok: false,
    code: "config/unknown-layer-kind",
    message: `unknown layer kind '${written}'${shown ? ` (did you mean '${shown}'?)` : ""}`
  };
}
function pointwiseOpNamed(written) {
  return pointwiseOpOf(splitDimension(written).base);
}

// src/config/layer-entry.ts
var KIND_KEYS = /* @__PURE__ */ new Set(["type", "layer", "kind"]);
var FORMS = "write a layer as '- conv: {channels: 64}', '- {type: Conv2d, out_channels: 64}' or '- relu'";
function readLayerEntry(item, sink) {
  const path = displayPath(item);
  if (item.kind === "scalar") {
    if (typeof item.value !== "string" || item.value.length === 0) {
      sink.error("config/type", `${path} must be a layer, got ${item.value === null ? "an empty entry" : String(item.value)}; ${FORMS}`, item.span);
      return void 0;
    }
    return withKind(item, item.value, item.span, item, [], void 0, sink);
  }
  if (item.kind === "seq") {
    sink.error("config/type", `${path} must be a layer, got a list; ${FORMS}`, item.span);
    return void 0;
  }
  const kindKeys = item.entries.filter((e) => KIND_KEYS.has(normaliseWord(e.key)));
  if (kindKeys.length > 1) {
    sink.error("config/layer-kind", `${path} gives its kind ${kindKeys.length} times (${kindKeys.map((e) => `'${e.writtenKey}'`).join(", ")}); keep one`, kindKeys[1].keySpan);
    return void 0;
  }
  if (kindKeys.length === 1) {
    const key = kindKeys[0];
    const v2 = key.value;
    if (v2.kind !== "scalar" || typeof v2.value !== "string" || v2.value.length === 0) {
      sink.error("config/type", `${displayPath(v2)} must be a layer kind such as 'Conv2d' or 'relu', got ${v2.kind === "scalar" ? String(v2.value) : `a ${v2.kind === "map" ? "mapping" : "list"}`}`, v2.span);
      return void 0;
    }
    return withKind(item, v2.value, v2.span, item, item.entries.filter((e) => e !== key), void 0, sink);
  }
  if (item.entries.length === 0) {
    sink.error("config/layer-kind", `${path} is an empty mapping; ${FORMS}`, item.span);
    return void 0;
  }
  if (item.entries.length > 1) {
    const kinds = item.entries.filter((e) => lookupKind(e.key).ok);
    const keys = item.entries.map((e) => `'${e.writtenKey}'`).join(", ");
    if (kinds.length > 1) {
      sink.error("config/layer-kind", `${path} has ${kinds.length} kinds (${keys}); one entry is one layer: put each kind in its own '- ' entry`, item.span);
    } else if (kinds.length === 1) {
      const stray = item.entries.find((e) => e !== kinds[0]);
      sink.error(
        "config/layer-kind",
        `${path} has '${stray.writtenKey}' beside its kind '${kinds[0].writtenKey}'; fields go inside the kind ('- ${kinds[0].writtenKey}: {${stray.writtenKey}: …}') or name the kind with 'type: ${kinds[0].writtenKey}'`,
        stray.keySpan
      );
    } else {
      sink.error("config/layer-kind", `${path} (${keys}) names no layer kind; give it with 'type', e.g. '- {type: conv, channels: 64}'`, item.span);
    }
    return void 0;
  }
  const only = item.entries[0];
  const v = only.value;
  if (v.kind === "seq") {
    sink.error("config/type", `${displayPath(v)} must be a mapping of the layer's fields, got a list`, v.span);
    return void 0;
  }
  if (v.kind === "map") return withKind(item, only.key, only.keySpan, v, v.entries, void 0, sink);
  return withKind(item, only.key, only.keySpan, v, [], v.value === null ? void 0 : v, sink);
}
function withKind(item, written, kindSpan, body, fields, scalar, sink) {
  const found = lookupKind(written);
  if (!found.ok) {
    sink.error(found.code, `${displayPath(item)}: ${found.message}`, kindSpan);
    return void 0;
  }
  return { item, match: found.match, kindWritten: written, kindSpan, body, fields, ...scalar ? { scalar } : {} };
}

// src/config/layer-fields.ts
var LayerFields = class {
  constructor(body, entries2, specs, sink) {
    this.body = body;
    this.specs = specs;
    const bySpelling = /* @__PURE__ */ new Map();
    for (const s of specs) for (const w of [s.name, ...s.aliases ?? []]) bySpelling.set(normaliseWord(w), s);
    const path = displayPath(body);
    for (const entry of entries2) {
      const spec = bySpelling.get(normaliseWord(entry.key));
      if (!spec) {
        this.unknown(entry, path, sink);
        continue;
      }
      if (spec.refused) {
        sink.error("config/unsupported-field", `${path}.${entry.writtenKey}: ${spec.refused}`, entry.keySpan);
        this.ok = false;
        continue;
      }
      const earlier = this.values.get(spec.name);
      if (earlier) {
        sink.error(
          "config/alias-conflict",
          `${path} gives '${earlier.writtenKey}' and '${entry.writtenKey}', which both mean '${spec.name}'; keep only one of them`,
          entry.keySpan
        );
        this.ok = false;
        continue;
      }
      this.values.set(spec.name, entry);
    }
  }
  body;
  specs;
  values = /* @__PURE__ */ new Map();
  /** Canonical fields that an unknown key was suggested as (a misspelt required field). */
  suggested = /* @__PURE__ */ new Set();
  /** False when a key was unknown, refused or given twice (already reported). */
  ok = true;
  unknown(entry, path, sink) {
    this.ok = false;
    if (entry.key === "<<") {
      sink.error("config/unknown-field", `${path} uses a YAML merge key ('<<'), which is not supported; write the fields out, or alias the whole mapping`, entry.keySpan);
      return;
    }
    const spellings = this.specs.flatMap((s) => s.refused ? [] : [s.name, ...s.aliases ?? []]);
    const guess = closest(normaliseWord(entry.key), spellings.map(normaliseWord));
    const said = guess ? spellings.find((s) => normaliseWord(s) === guess) : void 0;
    const meant = said ? this.specs.find((s) => s.name === said || s.aliases?.includes(said)) : void 0;
    if (meant) this.suggested.add(meant.name);
    const read = this.specs.filter((s) => !s.ignored && !s.refused).map((s) => s.name);
    sink.error(
      "config/unknown-field",
      `unknown field '${entry.writtenKey}' in ${path}${said ? ` (did you mean '${said}'?)` : ""}; it reads ${read.join(", ")}`,
      entry.keySpan
    );
  }
  get(name) {
    return this.values.get(name)?.value;
  }
  has(name) {
    return this.values.has(name);
  }
  /** An unknown key was reported with "did you mean" this field (so its absence is not reported again). */
  wasSuggested(name) {
    return this.suggested.has(name);
  }
  /** The key as written, for messages. */
  written(name) {
    return this.values.get(name)?.writtenKey ?? name;
  }
  keySpan(name) {
    return this.values.get(name)?.keySpan;
  }
  /** Per read field, what `of` says of its value; fields it says nothing of are left out. */
  provenance(of) {
    const out = {};
    for (const [name, entry] of this.values) {
      const found = of(entry.value);
      if (found.length > 0) out[name] = found;
    }
    return out;
  }
  /** Value spans of the given canonical fields that are present (all read fields when omitted). */
  spans(names) {
    const out = {};
    for (const [name, entry] of this.values) {
      if (names && !names.includes(name)) continue;
      const spec = this.specs.find((s) => s.name === name);
      if (!spec?.ignored) out[name] = entry.value.span;
    }
    return out;
  }
};

// src/config/layer-vocabulary.ts
var f = (name, doc, aliases = []) => ({ name, doc, aliases });
var ignored = (name, doc, aliases = []) => ({ name, doc, aliases, ignored: true });
var NAME = f("name", "a label for reports, and the name that `add`/`concat` `from:` refers to");
var SHORTCUT_FIELDS = [
  f("norm", "a normalisation after the layer: batch, layer, group, instance, …", ["normalization", "normalisation"]),
  f("batch_norm", "true: a batch normalisation after the layer", ["bn", "use_bn", "use_batch_norm", "batch_normalization"]),
  f("layer_norm", "true: a layer normalisation after the layer", ["use_layer_norm"]),
  f("activation", "an activation after the normalisation: relu, gelu, …; `linear`/`none`: no activation", ["act"]),
  f("dropout", "a dropout (of this rate) after the activation", ["dropout_rate"])
];
var TRAINING_ONLY = [
  ignored("kernel_initializer", "accepted, ignored", ["weight_init", "init"]),
  ignored("bias_initializer", "accepted, ignored"),
  ignored("kernel_regularizer", "accepted, ignored"),
  ignored("bias_regularizer", "accepted, ignored"),
  ignored("activity_regularizer", "accepted, ignored"),
  ignored("kernel_constraint", "accepted, ignored"),
  ignored("bias_constraint", "accepted, ignored"),
  ignored("trainable", "accepted, ignored"),
  ignored("dtype", "accepted, ignored"),
  ignored("data_format", "accepted, ignored (grids are [length] or [height, width]; channels are the width)")
];
var BIAS = f("bias", "false: the real layer has no bias (only the parameter count reads it; default true)", ["use_bias"]);
var IN_CHANNELS = ignored("in_channels", "accepted, ignored: the input width follows from the previous layer", ["in_features", "input_dim"]);
var WINDOW_CONV = [
  f("kernel", "window size per axis (default 1)", ["kernel_size"]),
  f("stride", "per axis (default 1)", ["strides"]),
  f("dilation", "spacing of the kernel taps per axis (default 1)", ["dilation_rate"])
];
var POINTWISE_PARAMS = {
  activation: ["inplace", "negative_slope", "alpha", "approximate", "beta", "threshold", "dim", "axis", "num_parameters", "max_value", "min_val", "max_val", "lower", "upper"],
  normalisation: ["num_features", "eps", "epsilon", "momentum", "affine", "track_running_stats", "num_groups", "groups", "num_channels", "normalized_shape", "elementwise_affine", "axis", "center", "scale", "size", "alpha", "beta", "k"],
  dropout: ["inplace", "noise_shape", "seed"],
  scaling: ["scale", "offset", "dim", "value"]
};
function pointwiseFields(family) {
  const params = (POINTWISE_PARAMS[family] ?? []).map((p) => ignored(p, "accepted, ignored"));
  const rate = family === "dropout" ? [f("rate", "the dropout rate (accepted; dropout is the identity at inference)", ["p"])] : [];
  return [...rate, ...params, NAME];
}
var WIDTH = f("width", "the width the layer reads and keeps; checked against its input", ["dim", "embed_dim", "embedding_dim", "d_model", "hidden_size", "hidden_dim", "n_embd"]);
var RECURRENT_FIELDS = [
  f("hidden", "hidden state size (required)", ["hidden_size", "units", "hidden_dim", "num_units"]),
  f("depth", "stacked layers (default 1)", ["num_layers", "n_layers"]),
  f("bidirectional", "true: a forward and a backward chain per level (default false)"),
  f("merge", "how a bidirectional layer joins its two directions at each step: `concat` (default; width 2·hidden) or `sum`", ["merge_mode"]),
  f("sequence", "true (default): one output per step; false: the final state only", ["return_sequences"]),
  f("proj_size", "only 0 is read: a projection changes the width the recurrence carries"),
  f("go_backwards", "only false is read: write bidirectional for both directions"),
  ignored("input_size", "accepted, ignored (the input width follows from the previous layer)"),
  ignored("nonlinearity", "accepted, ignored (the surrogate integrates multiplicatively)", ["activation"]),
  ignored("recurrent_activation", "accepted, ignored (gates are not modelled)"),
  ignored("dropout", "accepted, ignored (between stacked layers; the identity at inference)"),
  ignored("recurrent_dropout", "accepted, ignored"),
  ignored("batch_first", "accepted, ignored", ["time_major"]),
  ignored("return_state", "accepted, ignored (the layer's output is analysed)"),
  ignored("stateful", "accepted, ignored"),
  ignored("unroll", "accepted, ignored"),
  ignored("reset_after", "accepted, ignored"),
  ignored("unit_forget_bias", "accepted, ignored"),
  ignored("recurrent_initializer", "accepted, ignored"),
  ignored("recurrent_regularizer", "accepted, ignored"),
  ignored("recurrent_constraint", "accepted, ignored"),
  BIAS,
  ...TRAINING_ONLY,
  NAME
];
var EMBEDDING_FIELDS = [
  f("dim", "embedding width (required)", ["embedding_dim", "embed_dim", "embedding_size", "d_model", "output_dim", "features"]),
  f("vocabulary", "rows of the table, one per token: gives the input its vocabulary, or must equal it", ["num_embeddings", "vocab_size", "vocabulary_size", "input_dim", "n_vocab", "num_tokens"]),
  ignored("padding_idx", "accepted, ignored: the padding token is read as an ordinary token (its row learned)", ["mask_zero"]),
  ignored("max_norm", "accepted, ignored (a lookup stays a lookup)"),
  ignored("norm_type", "accepted, ignored"),
  ignored("scale_grad_by_freq", "accepted, ignored"),
  ignored("sparse", "accepted, ignored"),
  ignored("input_length", "accepted, ignored (the length is input.shape)"),
  ignored("embeddings_initializer", "accepted, ignored"),
  ignored("embeddings_regularizer", "accepted, ignored"),
  ignored("embeddings_constraint", "accepted, ignored"),
  ...TRAINING_ONLY,
  ...SHORTCUT_FIELDS,
  NAME
];
var POSITION_FIELDS = [
  f("mode", "`learned` (default; also `learnable`, `absolute`) or `fixed` (`sinusoidal`, `sincos`): both read as a learned vector per position", ["encoding", "position_embedding_type"]),
  f("positions", "rows of the table: at least the positions of the grid", [
    "max_len",
    "max_length",
    "max_position_embeddings",
    "num_positions",
    "n_positions",
    "max_seq_len",
    "max_seq_length",
    "context_length",
    "block_size"
  ]),
  WIDTH,
  ignored("initializer", "accepted, ignored"),
  ...SHORTCUT_FIELDS,
  NAME
];
var HEADS = f("heads", "attention heads (required)", ["num_heads", "n_head", "n_heads", "nhead", "num_attention_heads"]);
var HEAD_DIM = f("head_dim", "width of each head's queries, keys and values (default: the width / heads)", ["key_dim", "head_size", "d_head", "kv_channels"]);
var CAUSAL = f("causal", "true: position i attends only to positions j ≤ i (default false)", ["is_causal", "masked", "autoregressive"]);
var MASK = f("mask", "`causal` (also `lower_triangular`), or `none` (`full`, `bidirectional`)", ["attn_mask", "attention_mask", "mask_type"]);
var WINDOW2 = f("window", "local attention (1D): position i attends only to j with |i − j| ≤ window", ["local_window", "attention_window", "window_size", "sliding_window"]);
var KV_HEADS = f("num_kv_heads", "only equal to heads is read (grouped keys and values are not modelled)", ["n_kv_heads", "num_key_value_heads", "n_kv_head"]);
var ROTARY = f("rotary", "only false is read: rotary position schemes act inside attention", ["use_rotary", "rope", "use_rope"]);
var ATTENTION_DROPOUT = ignored("dropout", "accepted, ignored (the identity at inference)", ["attn_dropout", "attention_dropout", "attn_pdrop", "attention_probs_dropout_prob"]);
var ATTENTION_FIELDS = [
  HEADS,
  HEAD_DIM,
  WIDTH,
  CAUSAL,
  MASK,
  WINDOW2,
  KV_HEADS,
  ROTARY,
  f("kdim", "only the input width is read (keys from another sequence are cross-attention)"),
  f("vdim", "only the input width is read"),
  f("value_dim", "only the head width is read"),
  f("add_bias_kv", "only false is read (a learned extra key and value)"),
  f("add_zero_attn", "only false is read"),
  {
    name: "output_shape",
    doc: "refused",
    aliases: [],
    refused: "the attention layer's output keeps its input width; a different output width is a dense layer after it"
  },
  { name: "attention_axes", doc: "refused", aliases: [], refused: "attention runs over every position of the grid (row-major); other axes are not read" },
  ATTENTION_DROPOUT,
  ignored("batch_first", "accepted, ignored"),
  BIAS,
  ...TRAINING_ONLY,
  NAME
];
var TRANSFORMER_FIELDS = [
  HEADS,
  HEAD_DIM,
  WIDTH,
  f("mlp", "hidden width of the position-wise MLP", ["dim_feedforward", "mlp_dim", "ffn_dim", "d_ff", "ff_dim", "feedforward_dim", "intermediate_size", "mlp_hidden_dim"]),
  f("mlp_ratio", "the MLP width as a multiple of the block width (default 4)", ["ffn_ratio", "mlp_expansion"]),
  f("activation", "the MLP's activation (default gelu)", ["act", "hidden_act", "ffn_activation", "mlp_activation"]),
  f("norm", "`pre` (default: a norm before attention and before the MLP) or `post` (after each sum)", ["norm_position", "norm_placement"]),
  f("norm_first", "true: `norm: pre`; false: `norm: post`", ["pre_norm", "prenorm"]),
  f("norm_type", "`layer` (default) or `rms`", ["norm_layer"]),
  CAUSAL,
  MASK,
  WINDOW2,
  KV_HEADS,
  ROTARY,
  f("depth", "blocks in a stack (default 1); copies are labelled name[1], name[2], …", ["num_layers", "n_layers", "n_layer"]),
  // Dropout is the identity at inference; blocks often give several rates, one per place.
  ignored("dropout", "accepted, ignored", ["dropout_rate"]),
  ignored("attention_dropout", "accepted, ignored", ["attn_dropout", "attn_pdrop", "attention_probs_dropout_prob"]),
  ignored("activation_dropout", "accepted, ignored"),
  ignored("resid_dropout", "accepted, ignored", ["resid_pdrop", "hidden_dropout", "hidden_dropout_prob"]),
  ignored("layer_norm_eps", "accepted, ignored", ["norm_eps", "eps", "epsilon"]),
  ignored("batch_first", "accepted, ignored"),
  BIAS,
  NAME
];
var LAYER_FIELDS = /* @__PURE__ */ new Map([
  [
    "conv",
    [
      f("channels", "output channels (required unless depthwise)", ["out_channels", "filters"]),
      ...WINDOW_CONV,
      f("padding", "`same` (default), `valid`, `causal` (1D), or zeros per side: an integer or [h, w]"),
      f("groups", "grouped conv: an integer dividing both widths, or `depthwise` (default 1)"),
      f("depthwise", "true: one group per input channel", []),
      f("depth_multiplier", "output channels per input channel of a depthwise conv (default 1)"),
      IN_CHANNELS,
      BIAS,
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  [
    "conv_transpose",
    [
      f("channels", "output channels", ["out_channels", "filters"]),
      ...WINDOW_CONV,
      f("padding", "zeros removed from both ends per axis (default 0), or `same` (output n·stride) or `valid`"),
      f("output_padding", "positions added at the end per axis (default 0)"),
      f("groups", "grouped transposed conv (default 1)"),
      IN_CHANNELS,
      BIAS,
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  [
    "separable_conv",
    [
      f("channels", "output channels of the 1×1 conv that follows the depthwise conv", ["out_channels", "filters"]),
      ...WINDOW_CONV,
      f("padding", "as for conv, of the depthwise conv"),
      f("depth_multiplier", "as for conv (default 1)"),
      IN_CHANNELS,
      BIAS,
      ignored("depthwise_initializer", "accepted, ignored"),
      ignored("pointwise_initializer", "accepted, ignored"),
      ...TRAINING_ONLY,
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  [
    "pool",
    [
      f("window", "window per axis (required unless global)", ["pool_size", "kernel_size"]),
      f("stride", "per axis (default: the window)", ["strides"]),
      f("padding", "`valid` (default), `same`, or zeros per side"),
      f("mode", "`max` (default), `average`/`avg`/`mean`, `sum`, `product`, `lp`"),
      f("global", "true: one position pooled from all that are left"),
      f("output_size", "adaptive pooling: only 1 (a global pool) is read"),
      { name: "ceil_mode", doc: "only false is read", aliases: [] },
      ignored("count_include_pad", "accepted, ignored"),
      ignored("keepdims", "accepted, ignored"),
      ignored("data_format", "accepted, ignored"),
      NAME
    ]
  ],
  ["dense", [f("units", "output units", ["out_features", "features", "output_dim"]), IN_CHANNELS, BIAS, ...TRAINING_ONLY, ...SHORTCUT_FIELDS, NAME]],
  ["flatten", [ignored("start_dim", "accepted, ignored"), ignored("end_dim", "accepted, ignored"), ignored("data_format", "accepted, ignored"), NAME]],
  [
    "upsample",
    [
      f("factor", "integer factor per axis (default 2)", ["scale_factor"]),
      f("mode", "`nearest` (default) or `linear` (`bilinear`)", ["interpolation"]),
      { name: "align_corners", doc: "only false is read", aliases: [] },
      {
        name: "size",
        doc: "refused",
        aliases: [],
        refused: "'size' is a factor in some frameworks and an output size in others; write 'factor' (the integer factor per axis)"
      },
      ignored("data_format", "accepted, ignored"),
      NAME
    ]
  ],
  ["recurrent", RECURRENT_FIELDS],
  ["embedding", EMBEDDING_FIELDS],
  ["position", POSITION_FIELDS],
  ["class_token", [WIDTH, ignored("initializer", "accepted, ignored"), NAME]],
  ["attention", ATTENTION_FIELDS],
  ["transformer_block", TRANSFORMER_FIELDS],
  ["repeat", [f("times", "how many copies (required)", ["count", "repeats"]), f("layers", "the layers repeated, in order"), NAME]],
  [
    "residual",
    [
      f("layers", "the main path", ["body", "main", "path"]),
      f("shortcut", "the shortcut path (absent or empty: the identity)", ["projection", "downsample", "skip"]),
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  [
    "branches",
    [
      f("paths", "a list of paths, each a list of layers (empty: the identity); at least two", ["branches"]),
      f("merge", "`concat` (default) or `sum`", ["mode"]),
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  ["add", [f("from", "the name (or list of names) of earlier layers added to the current grid"), ...SHORTCUT_FIELDS, NAME]],
  [
    "concat",
    [
      f("from", "the name (or list of names) of earlier layers joined to the current grid"),
      ignored("axis", "accepted, ignored (always the channels)", ["dim"]),
      ...SHORTCUT_FIELDS,
      NAME
    ]
  ],
  ["sequence", [f("layers", "the layers, in order"), NAME]],
  ["activation", [f("fn", "the function: relu, gelu, …", ["function", "activation"]), ...pointwiseFields("activation").filter((s) => s.name !== "name"), NAME]]
]);
function fieldsOf(kind, family) {
  if (kind === "pointwise") return pointwiseFields(family ?? "activation");
  return LAYER_FIELDS.get(kind) ?? [NAME];
}

// src/config/padding-field.ts
function readPadding(node, ctx, words) {
  if (node.kind === "scalar" && typeof node.value === "number") {
    const amount = readPerAxis(node, ctx, 0);
    return amount && { mode: "explicit", amount };
  }
  if (node.kind === "seq") {
    const amount = readPerAxis(node, ctx, 0);
    return amount && { mode: "explicit", amount };
  }
  const word = readChoice(node, ctx, new Map(words.map((w) => [w, w])), words);
  return word && { mode: word };
}

// src/config/shortcut-fields.ts
var NORM_WORDS = /* @__PURE__ */ new Map([
  ["batch", "batch_norm"],
  ["layer", "layer_norm"],
  ["group", "group_norm"],
  ["instance", "instance_norm"],
  ["local_response", "local_response_norm"],
  ["rms", "rms_norm"]
]);
var NONE_WORDS = /* @__PURE__ */ new Set(["none", "null", "linear", "identity", "false", "off"]);
var BOOLEAN_NORMS = [
  ["batch_norm", "batch_norm"],
  ["layer_norm", "layer_norm"]
];
function readShortcutFields(fields, ctx) {
  let ok = true;
  const out = [];
  const add2 = (field, node, op) => {
    const keySpan = fields.keySpan(field) ?? node.span;
    out.push({
      body: { kind: "pointwise", family: op.family, op: op.op },
      site: { path: pointerOf(node), span: spanJoin(keySpan, node.span), fieldSpans: { [field]: node.span } }
    });
  };
  const norms = [];
  const normNode = fields.get("norm");
  if (normNode) {
    const op = readNorm(normNode, ctx);
    if (op === void 0) ok = false;
    else if (op !== null) norms.push({ field: "norm", node: normNode, op });
  }
  for (const [field, opName] of BOOLEAN_NORMS) {
    const node = fields.get(field);
    if (!node) continue;
    const on = readBoolean(node, ctx);
    if (on === void 0) ok = false;
    else if (on) norms.push({ field, node, op: pointwiseOpOf(normaliseWord(opName)) });
  }
  if (norms.length > 1) {
    const second = norms[1];
    ctx.sink.error(
      "config/conflicting-fields",
      `${displayPath(fields.body)} gives a normalisation twice ('${fields.written(norms[0].field)}' and '${fields.written(second.field)}'); keep one`,
      fields.keySpan(second.field) ?? second.node.span
    );
    ok = false;
  } else if (norms.length === 1) {
    add2(norms[0].field, norms[0].node, norms[0].op);
  }
  const actNode = fields.get("activation");
  if (actNode) {
    const op = readActivation(actNode, ctx);
    if (op === void 0) ok = false;
    else if (op !== null) add2("activation", actNode, op);
  }
  const dropNode = fields.get("dropout");
  if (dropNode) {
    const rate = readRate(dropNode, ctx);
    if (rate === void 0) ok = false;
    else if (rate > 0) add2("dropout", dropNode, pointwiseOpOf("dropout"));
  }
  return ok ? out : void 0;
}
function isNone(node) {
  if (node.kind !== "scalar") return false;
  if (node.value === null || node.value === false) return true;
  return typeof node.value === "string" && NONE_WORDS.has(node.value.toLowerCase());
}
function readNorm(node, ctx) {
  if (isNone(node)) return null;
  if (node.kind === "scalar" && typeof node.value === "string") {
    const short = lookupChoice(node.value, NORM_WORDS);
    const op = short !== void 0 ? pointwiseOpOf(normaliseWord(short)) : pointwiseOpNamed(node.value);
    if (op?.family === "normalisation") return op;
  }
  return badOp(node, ctx, "a normalisation", [...NORM_WORDS.keys(), "none"]);
}
function readActivation(node, ctx, noneAllowed = true) {
  if (noneAllowed && isNone(node)) return null;
  if (node.kind === "scalar" && typeof node.value === "string") {
    const op = pointwiseOpNamed(node.value);
    if (op?.family === "activation") return op;
    if (op) {
      ctx.sink.error("config/invalid-value", `${displayPath(node)} names ${op.op}, which is a ${op.family} layer, not an activation`, node.span);
      return void 0;
    }
  }
  return badOp(node, ctx, "an activation function", [...opsOf("activation"), ...noneAllowed ? ["linear"] : []]);
}
function badOp(node, ctx, what, known) {
  const word = node.kind === "scalar" && typeof node.value === "string" ? node.value : void 0;
  const guess = word ? closest(word, known) : void 0;
  const got = word !== void 0 ? `'${word}'` : node.kind === "scalar" ? String(node.value) : `a ${node.kind === "map" ? "mapping" : "list"}`;
  ctx.sink.error(
    word !== void 0 ? "config/invalid-value" : "config/type",
    `${displayPath(node)} must be ${what} (${known.join(", ")}), got ${got}${guess ? ` (did you mean '${guess}'?)` : ""}`,
    node.span
  );
  return void 0;
}

// src/config/entry-read.ts
function chainOf(r, ctx, layers, shortcuts) {
  const after = shortcuts ? readShortcutFields(r.fields, ctx) : [];
  if (!after) return void 0;
  return { t: "chain", layers: [...layers, ...after], ...r.name ? { name: r.name } : {} };
}
function requireField(r, field, what, ctx) {
  if (r.fields.has(field)) return true;
  if (r.fields.wasSuggested(field)) return false;
  ctx.sink.error("config/missing-field", `${displayPath(r.entry.body)} is missing '${field}' (${what})`, r.entry.body.span);
  return false;
}
function optionalPositive(r, field, ctx) {
  const node = r.fields.get(field);
  if (!node) return void 0;
  return readPositiveInteger(node, ctx) ?? false;
}
function readBias(r, ctx) {
  const node = r.fields.get("bias");
  if (!node) return {};
  const b = readBoolean(node, ctx);
  if (b === void 0) return void 0;
  return b ? {} : { bias: false };
}

// src/config/read-conv-layers.ts
function readWindow(r, ctx) {
  const axis = (field) => {
    const node = r.fields.get(field);
    if (!node) return ctx.dims === void 0 ? void 0 : new Array(ctx.dims).fill(1);
    return readPerAxis(node, ctx);
  };
  const kernel = axis("kernel");
  const stride = axis("stride");
  const dilation = axis("dilation");
  return kernel && stride && dilation ? { kernel, stride, dilation } : void 0;
}
function readConv(r, ctx) {
  const window = readWindow(r, ctx);
  const paddingNode = r.fields.get("padding");
  const padding = paddingNode ? readPadding(paddingNode, ctx, ["same", "valid", "causal"]) : { mode: "same" };
  const groups = readGroups(r, ctx);
  const channels = optionalPositive(r, "channels", ctx);
  const bias = readBias(r, ctx);
  let ok = window !== void 0 && padding !== void 0 && groups !== void 0 && channels !== false && bias !== void 0;
  if (groups && groups.groups !== "depthwise" && !r.fields.has("channels")) ok = requireField(r, "channels", "output channels", ctx) && ok;
  if (!ok || !window || !padding || !groups || channels === false || !bias) return void 0;
  const body = {
    kind: "conv",
    ...channels !== void 0 ? { channels } : {},
    ...window,
    padding,
    groups: groups.groups,
    depthMultiplier: groups.depthMultiplier,
    ...bias
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], true);
}
function readGroups(r, ctx) {
  let depthwise = r.entry.match.depthwise === true;
  let groups = 1;
  let ok = true;
  const flag2 = r.fields.get("depthwise");
  if (flag2) {
    const v = readBoolean(flag2, ctx);
    if (v === void 0) ok = false;
    else if (v) depthwise = true;
  }
  const groupsNode = r.fields.get("groups");
  if (groupsNode) {
    if (groupsNode.kind === "scalar" && typeof groupsNode.value === "string" && groupsNode.value.toLowerCase() === "depthwise") {
      depthwise = true;
    } else if (groupsNode.kind === "scalar" && typeof groupsNode.value === "number") {
      const g = readPositiveInteger(groupsNode, ctx);
      if (g === void 0) ok = false;
      else if (depthwise) {
        ctx.sink.error("config/conflicting-fields", `${displayPath(groupsNode)} is ${g}, but the conv is depthwise (one group per input channel); drop one of them`, groupsNode.span);
        ok = false;
      } else groups = g;
    } else {
      ctx.sink.error("config/type", `${displayPath(groupsNode)} must be a positive integer or 'depthwise', got ${groupsNode.kind === "scalar" ? String(groupsNode.value) : "a " + (groupsNode.kind === "map" ? "mapping" : "list")}`, groupsNode.span);
      ok = false;
    }
  }
  const multNode = r.fields.get("depth_multiplier");
  let depthMultiplier = 1;
  if (multNode) {
    const m = readPositiveInteger(multNode, ctx);
    if (m === void 0) ok = false;
    else if (!depthwise) {
      ctx.sink.error("config/conflicting-fields", `${displayPath(multNode)} applies to depthwise convs only; add 'depthwise: true' or drop it`, multNode.span);
      ok = false;
    } else depthMultiplier = m;
  }
  return ok ? { groups: depthwise ? "depthwise" : groups, depthMultiplier } : void 0;
}
function readConvTranspose(r, ctx) {
  const window = readWindow(r, ctx);
  const channels = optionalPositive(r, "channels", ctx);
  const groups = optionalPositive(r, "groups", ctx);
  const bias = readBias(r, ctx);
  let ok = requireField(r, "channels", "output channels", ctx);
  const pads = window && readTransposePadding(r, window, ctx);
  ok = ok && window !== void 0 && pads !== void 0 && channels !== void 0 && channels !== false && groups !== false && bias !== void 0;
  if (!ok || !window || !pads || channels === void 0 || channels === false || groups === false || !bias) return void 0;
  const body = {
    kind: "conv-transpose",
    channels,
    ...window,
    padding: pads.padding,
    outputPadding: pads.outputPadding,
    groups: groups ?? 1,
    ...bias
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], true);
}
function readTransposePadding(r, w, ctx) {
  const node = r.fields.get("padding");
  const outNode = r.fields.get("output_padding");
  const dims = w.kernel.length;
  const outputPadding = outNode ? readPerAxis(outNode, ctx, 0) : new Array(dims).fill(0);
  if (!node || node.kind === "seq" || node.kind === "scalar" && typeof node.value === "number") {
    const padding2 = node ? readPerAxis(node, ctx, 0) : new Array(dims).fill(0);
    return padding2 && outputPadding ? { padding: padding2, outputPadding } : void 0;
  }
  const word = readPadding(node, ctx, ["same", "valid"]);
  if (!word || !outputPadding) return void 0;
  if (outNode) {
    ctx.sink.error("config/conflicting-fields", `${displayPath(outNode)} cannot be combined with padding '${word.mode}', which sets the output length itself; give padding as zeros per side instead`, outNode.span);
    return void 0;
  }
  const padding = [];
  const extra = [];
  for (let a = 0; a < dims; a++) {
    const e = extent(w.kernel[a], w.dilation[a]);
    const s = w.stride[a];
    if (word.mode === "same" && e >= s) {
      const p = Math.ceil((e - s) / 2);
      padding.push(p);
      extra.push(2 * p - (e - s));
    } else {
      padding.push(0);
      extra.push(Math.max(s - e, 0));
    }
  }
  return { padding, outputPadding: extra };
}
function readSeparableConv(r, ctx) {
  const window = readWindow(r, ctx);
  const paddingNode = r.fields.get("padding");
  const padding = paddingNode ? readPadding(paddingNode, ctx, ["same", "valid", "causal"]) : { mode: "same" };
  const channels = optionalPositive(r, "channels", ctx);
  const mult = optionalPositive(r, "depth_multiplier", ctx);
  const bias = readBias(r, ctx);
  const ok = requireField(r, "channels", "output channels of the 1×1 conv", ctx);
  if (!ok || !window || !padding || channels === void 0 || channels === false || mult === false || !bias) return void 0;
  const ones = window.kernel.map(() => 1);
  const spans2 = (names) => ({ ...r.site, fieldSpans: r.fields.spans(names) });
  const depthwise = {
    body: { kind: "conv", ...window, padding, groups: "depthwise", depthMultiplier: mult ?? 1, bias: false },
    site: spans2(["kernel", "stride", "dilation", "padding", "depth_multiplier"])
  };
  const pointwise = {
    body: { kind: "conv", channels, kernel: ones, stride: ones, dilation: ones, padding: { mode: "valid" }, groups: 1, depthMultiplier: 1, ...bias },
    site: spans2(["channels", "bias"]),
    labelled: true
  };
  return chainOf(r, ctx, [depthwise, pointwise], true);
}

// src/config/read-grid-layers.ts
var POOL_MODES = /* @__PURE__ */ new Map([
  ["max", "max"],
  ["average", "average"],
  ["avg", "average"],
  ["mean", "average"],
  ["sum", "sum"],
  ["product", "product"],
  ["prod", "product"],
  ["lp", "other"]
]);
var POOL_MODE_WORDS = ["max", "average", "avg", "mean", "sum", "product", "lp"];
function readPool(r, ctx) {
  const { match } = r.entry;
  let ok = true;
  let mode = match.poolMode ?? "max";
  const modeNode = r.fields.get("mode");
  if (modeNode) {
    const m = readChoice(modeNode, ctx, POOL_MODES, POOL_MODE_WORDS);
    if (m === void 0) ok = false;
    else if (match.poolMode !== void 0 && m !== match.poolMode) {
      ctx.sink.error("config/conflicting-fields", `${displayPath(modeNode)} says ${m}, but '${r.entry.kindWritten}' is a ${match.poolMode} pool; drop one of them`, modeNode.span);
      ok = false;
    } else mode = m;
  }
  let global = match.global === true;
  const globalNode = r.fields.get("global");
  if (globalNode) {
    const g = readBoolean(globalNode, ctx);
    if (g === void 0) ok = false;
    else if (match.global && !g) {
      ctx.sink.error("config/conflicting-fields", `${displayPath(globalNode)} is false, but '${r.entry.kindWritten}' is a global pool; drop it`, globalNode.span);
      ok = false;
    } else global = g;
  }
  const sizeNode = r.fields.get("output_size");
  if (sizeNode) {
    global = true;
    const size = readPerAxis(sizeNode, ctx);
    if (size === void 0) ok = false;
    else if (size.some((n) => n !== 1)) {
      ctx.sink.error(
        "config/adaptive-pool",
        `${displayPath(sizeNode)} is [${size.join(", ")}]: adaptive pooling is read only to size 1 (a global pool), because its windows depend on the input size; write a pool with a fixed window instead (window = input size / output size, e.g. window: 2 to go from 14 to 7)`,
        sizeNode.span
      );
      ok = false;
    }
  } else if (match.adaptive) {
    ok = requireField(r, "output_size", "the output size; only 1 is read", ctx) && ok;
  }
  const ceil2 = r.fields.get("ceil_mode");
  if (ceil2 && !readOnly(ceil2, ctx, false, "rounding the output length up changes the grid; give the padding instead")) ok = false;
  const windowNode = r.fields.get("window");
  const strideNode = r.fields.get("stride");
  const paddingNode = r.fields.get("padding");
  if (global) {
    for (const [node, field] of [
      [windowNode, "window"],
      [strideNode, "stride"],
      [paddingNode, "padding"]
    ]) {
      if (!node) continue;
      ctx.sink.error("config/conflicting-fields", `${displayPath(r.entry.body)} has both '${r.fields.written(field)}' and a global pool; give a window or pool globally, not both`, r.fields.keySpan(field) ?? node.span);
      ok = false;
    }
    if (!ok) return void 0;
    return chainOf(r, ctx, [{ body: { kind: "pool", mode, window: [], stride: [], padding: { mode: "valid" }, global: true }, site: r.site, labelled: true }], false);
  }
  if (!windowNode) {
    if (r.fields.wasSuggested("window")) return void 0;
    ctx.sink.error("config/missing-field", `${displayPath(r.entry.body)} needs 'window' (the pooling window, e.g. 2 or [2, 2]) or 'global: true'`, r.entry.body.span);
    return void 0;
  }
  const window = readPerAxis(windowNode, ctx);
  const stride = strideNode ? readPerAxis(strideNode, ctx) : window;
  const padding = paddingNode ? readPadding(paddingNode, ctx, ["valid", "same"]) : { mode: "valid" };
  if (!ok || !window || !stride || !padding) return void 0;
  return chainOf(r, ctx, [{ body: { kind: "pool", mode, window, stride, padding, global: false }, site: r.site, labelled: true }], false);
}
var UPSAMPLE_MODES = /* @__PURE__ */ new Map([
  ["nearest", "nearest"],
  ["linear", "linear"],
  ["bilinear", "linear"]
]);
function readUpsample(r, ctx) {
  let ok = true;
  let mode = r.entry.match.upsampleMode ?? "nearest";
  const modeNode = r.fields.get("mode");
  if (modeNode) {
    const m = readChoice(modeNode, ctx, UPSAMPLE_MODES, ["nearest", "linear", "bilinear"]);
    if (m === void 0) ok = false;
    else mode = m;
  }
  const align = r.fields.get("align_corners");
  if (align && !readOnly(align, ctx, false, "linear upsampling is read with half-pixel centres (align_corners false)")) ok = false;
  const factorNode = r.fields.get("factor");
  const factor = factorNode ? readPerAxis(factorNode, ctx) : ctx.dims === void 0 ? void 0 : new Array(ctx.dims).fill(2);
  if (!ok || !factor) return void 0;
  return chainOf(r, ctx, [{ body: { kind: "upsample", factor, mode }, site: r.site, labelled: true }], false);
}

// src/config/read-plain-layers.ts
function readDense(r, ctx) {
  const ok = requireField(r, "units", "output units", ctx);
  const unitsNode = r.fields.get("units");
  const units = unitsNode && readPositiveInteger(unitsNode, ctx);
  const bias = readBias(r, ctx);
  if (!ok || units === void 0 || !bias) return void 0;
  return chainOf(r, ctx, [{ body: { kind: "dense", units, ...bias }, site: r.site, labelled: true }], true);
}
function readFlatten(r, ctx) {
  return chainOf(r, ctx, [{ body: { kind: "flatten" }, site: r.site, labelled: true }], false);
}
function readPointwise2(r, ctx) {
  const op = r.entry.match.op;
  let ok = true;
  const rateNode = r.fields.get("rate") ?? r.entry.scalar;
  if (r.entry.scalar && op.family !== "dropout") {
    ctx.sink.error("config/type", `${displayPath(r.entry.scalar)} must be a mapping of the layer's fields (or nothing), got ${String(r.entry.scalar.value)}`, r.entry.scalar.span);
    ok = false;
  } else if (rateNode && readRate(rateNode, ctx) === void 0) ok = false;
  if (!ok) return void 0;
  return chainOf(r, ctx, [{ body: { kind: "pointwise", family: op.family, op: op.op }, site: r.site, labelled: true }], false);
}
function readActivationLayer(r, ctx) {
  const fnNode = r.fields.get("fn") ?? r.entry.scalar;
  if (!fnNode) {
    requireField(r, "fn", "the function, e.g. relu", ctx);
    return void 0;
  }
  const read = readActivation(fnNode, ctx);
  if (read === void 0) return void 0;
  const op = read ?? pointwiseOpOf("identity");
  return chainOf(r, ctx, [{ body: { kind: "pointwise", family: op.family, op: op.op }, site: r.site, labelled: true }], false);
}

// src/config/read-sequence-layers.ts
function stated(node, value) {
  return { value, span: node.span, where: displayPath(node) };
}
function declaredOf(r, field, against, ctx) {
  const node = r.fields.get(field);
  if (!node) return [];
  const v = readPositiveInteger(node, ctx);
  return v === void 0 ? void 0 : [{ ...stated(node, v), against }];
}
var MERGE_MODES = /* @__PURE__ */ new Map([
  ["concat", "concat"],
  ["concatenate", "concat"],
  ["cat", "concat"],
  ["sum", "sum"],
  ["add", "sum"]
]);
var OTHER_MERGES = /* @__PURE__ */ new Set(["mul", "multiply", "product", "prod", "ave", "avg", "average", "mean", "none", "null"]);
function readMerge(node, ctx) {
  const word = node.kind === "scalar" ? node.value === null ? "null" : typeof node.value === "string" ? node.value : void 0 : void 0;
  if (word !== void 0 && lookupChoice(word, MERGE_MODES) === void 0 && OTHER_MERGES.has(word.toLowerCase())) {
    const none = word.toLowerCase() === "none" || word === "null";
    ctx.sink.error(
      "config/unsupported-value",
      `${displayPath(node)} is ${node.kind === "scalar" && node.value === null ? "empty" : `'${word}'`}, which is not read: ${none ? "the two directions returned separately cannot be read by the next layer of a list" : "a product or an average of the two directions is not modelled"}; write 'concat' (the width doubles) or 'sum'`,
      node.span
    );
    return void 0;
  }
  return readChoice(node, ctx, MERGE_MODES, ["concat", "sum"]);
}
function readRecurrent(r, ctx) {
  let ok = requireField(r, "hidden", "hidden state size", ctx);
  const hidden = optionalPositive(r, "hidden", ctx);
  const depth = optionalPositive(r, "depth", ctx);
  const flag2 = (field, fallback) => {
    const node = r.fields.get(field);
    return node ? readBoolean(node, ctx) : fallback;
  };
  const bidirectional = flag2("bidirectional", false);
  const sequence = flag2("sequence", true);
  const mergeNode = r.fields.get("merge");
  const merge = mergeNode ? readMerge(mergeNode, ctx) : "concat";
  const proj = r.fields.get("proj_size");
  if (proj) {
    const p = readNonNegativeInteger(proj, ctx);
    if (p === void 0) ok = false;
    else if (p !== 0) {
      ctx.sink.error("config/unsupported-value", `${displayPath(proj)} is ${p}, which is not read: a projection of the hidden state changes the width the recurrence carries; only 0 (none) is read`, proj.span);
      ok = false;
    }
  }
  const back = r.fields.get("go_backwards");
  if (back && !readOnly(back, ctx, false, "a layer that reads the sequence backwards only is not read; write bidirectional: true for both directions")) ok = false;
  const bias = readBias(r, ctx);
  if (!ok || hidden === void 0 || hidden === false || depth === false || bidirectional === void 0 || sequence === void 0 || !merge || !bias) return void 0;
  const body = {
    kind: "recurrent",
    hidden,
    depth: depth ?? 1,
    cell: r.entry.match.cell ?? "arithmetic",
    bidirectional,
    merge,
    sequence,
    ...bias
  };
  return chainOf(r, ctx, [{ body, site: r.site, labelled: true }], false);
}
function readEmbedding(r, ctx) {
  const ok = requireField(r, "dim", "the embedding width", ctx);
  const dim = optionalPositive(r, "dim", ctx);
  const vocabNode = r.fields.get("vocabulary");
  const vocabulary = vocabNode ? readPositiveInteger(vocabNode, ctx) : void 0;
  if (!ok || dim === void 0 || dim === false || vocabNode && vocabulary === void 0) return void 0;
  const made = {
    body: { kind: "embedding", dim },
    site: r.site,
    labelled: true,
    ...vocabNode && vocabulary !== void 0 ? { vocabulary: stated(vocabNode, vocabulary) } : {}
  };
  return chainOf(r, ctx, [made], true);
}
var POSITION_MODES = /* @__PURE__ */ new Map([
  ["learned", "learned"],
  ["learnable", "learned"],
  ["trainable", "learned"],
  ["absolute", "learned"],
  ["embedding", "learned"],
  ["fixed", "fixed"],
  ["sinusoidal", "fixed"],
  ["sinusoid", "fixed"],
  ["sine", "fixed"],
  ["sincos", "fixed"],
  ["sin_cos", "fixed"],
  ["static", "fixed"]
]);
var INSIDE_ATTENTION = /* @__PURE__ */ new Set(["rotary", "rope", "alibi", "relative", "relative_key", "relative_key_query", "relative_position", "t5_relative"]);
function readPositionMode(r, ctx) {
  const { match } = r.entry;
  const node = r.fields.get("mode");
  if (!node) return match.positionMode ?? match.positionDefault ?? "learned";
  if (node.kind === "scalar" && typeof node.value === "string" && INSIDE_ATTENTION.has(node.value.toLowerCase().replace(/-/g, "_"))) {
    ctx.sink.error(
      "config/unsupported-value",
      `${displayPath(node)} is '${node.value}', which is not read: rotary and relative position schemes act inside attention, which linearised attention does not model; additive position vectors are read ('learned' or 'fixed')`,
      node.span
    );
    return void 0;
  }
  const mode = readChoice(node, ctx, POSITION_MODES, ["learned", "fixed", "sinusoidal"]);
  if (mode !== void 0 && match.positionMode !== void 0 && mode !== match.positionMode) {
    ctx.sink.error("config/conflicting-fields", `${displayPath(node)} says ${mode}, but '${r.entry.kindWritten}' is a ${match.positionMode} encoding; drop one of them`, node.span);
    return void 0;
  }
  return mode;
}
function readPosition(r, ctx) {
  const mode = readPositionMode(r, ctx);
  const positions = declaredOf(r, "positions", "positions", ctx);
  const width = declaredOf(r, "width", "input-width", ctx);
  if (!mode || !positions || !width) return void 0;
  const declared = [...positions, ...width];
  return chainOf(r, ctx, [{ body: { kind: "position", mode }, site: r.site, labelled: true, ...declared.length > 0 ? { declared } : {} }], true);
}
function readClassToken(r, ctx) {
  const width = declaredOf(r, "width", "input-width", ctx);
  if (!width) return void 0;
  return chainOf(r, ctx, [{ body: { kind: "class-token" }, site: r.site, labelled: true, ...width.length > 0 ? { declared: width } : {} }], false);
}
var MASKS = /* @__PURE__ */ new Map([
  ["causal", true],
  ["lower_triangular", true],
  ["triangular", true],
  ["autoregressive", true],
  ["none", false],
  ["full", false],
  ["bidirectional", false]
]);
function readCausal(r, ctx) {
  const byName = r.entry.match.causal === true;
  const causalNode = r.fields.get("causal");
  const maskNode = r.fields.get("mask");
  const fromFlag = causalNode ? readBoolean(causalNode, ctx) : null;
  const fromMask = maskNode ? maskNode.kind === "scalar" && maskNode.value === null ? false : readChoice(maskNode, ctx, MASKS, ["causal", "none"]) : null;
  if (fromFlag === void 0 || fromMask === void 0) return void 0;
  const said = [];
  if (causalNode && fromFlag !== null) said.push({ node: causalNode, value: fromFlag });
  if (maskNode && fromMask !== null) said.push({ node: maskNode, value: fromMask });
  for (const s of said) {
    if (byName && !s.value) {
      ctx.sink.error("config/conflicting-fields", `${displayPath(s.node)} turns the causal mask off, but '${r.entry.kindWritten}' is causal attention; drop one of them`, s.node.span);
      return void 0;
    }
  }
  if (said.length === 2 && said[0].value !== said[1].value) {
    ctx.sink.error("config/conflicting-fields", `${displayPath(said[1].node)} disagrees with ${displayPath(said[0].node)} about the causal mask; keep one of them`, said[1].node.span);
    return void 0;
  }
  return byName || said.some((s) => s.value);
}
function readAttentionFields(r, ctx) {
  let ok = requireField(r, "heads", "the number of attention heads", ctx);
  const heads = optionalPositive(r, "heads", ctx);
  const headDim = optionalPositive(r, "head_dim", ctx);
  const causal = readCausal(r, ctx);
  const windowNode = r.fields.get("window");
  const window = windowNode ? readNonNegativeInteger(windowNode, ctx) : void 0;
  if (windowNode && window === void 0) ok = false;
  if (!windowNode && r.entry.match.local === true) ok = requireField(r, "window", "how far each position attends on either side", ctx) && ok;
  const kv = r.fields.get("num_kv_heads");
  if (kv) {
    const k = readPositiveInteger(kv, ctx);
    if (k === void 0) ok = false;
    else if (typeof heads === "number" && k !== heads) {
      ctx.sink.error(
        "config/unsupported-value",
        `${displayPath(kv)} is ${k}, which is not read: keys and values shared by groups of query heads are not modelled; only ${heads} (one per head) is read`,
        kv.span
      );
      ok = false;
    }
  }
  for (const [field, why] of [
    ["rotary", "rotary position schemes rotate queries and keys per position, which linearised attention does not model; add position vectors (position) instead"],
    ["add_bias_kv", "a learned extra key and value is not modelled"],
    ["add_zero_attn", "an extra zero key and value is not modelled"]
  ]) {
    const node = r.fields.get(field);
    if (node && !readOnly(node, ctx, false, why)) ok = false;
  }
  const declared = [];
  for (const [field, against] of [
    ["width", "input-width"],
    ["kdim", "input-width"],
    ["vdim", "input-width"],
    ["value_dim", "head-width"]
  ]) {
    const d = declaredOf(r, field, against, ctx);
    if (d) declared.push(...d);
    else ok = false;
  }
  const bias = readBias(r, ctx);
  if (!ok || heads === void 0 || heads === false || headDim === false || causal === void 0 || !bias) return void 0;
  return {
    body: { kind: "attention", heads, ...headDim !== void 0 ? { headDim } : {}, causal, ...window !== void 0 ? { window } : {}, ...bias },
    declared
  };
}
function readAttention(r, ctx) {
  const read = readAttentionFields(r, ctx);
  if (!read) return void 0;
  return chainOf(r, ctx, [{ body: read.body, site: r.site, labelled: true, ...read.declared.length > 0 ? { declared: read.declared } : {} }], false);
}

// src/config/read-transformer-block.ts
var DEFAULT_MLP_RATIO = 4;
var PLACEMENTS = /* @__PURE__ */ new Map([
  ["pre", "pre"],
  ["pre_norm", "pre"],
  ["prenorm", "pre"],
  ["post", "post"],
  ["post_norm", "post"],
  ["postnorm", "post"]
]);
var NORM_TYPES = /* @__PURE__ */ new Map([
  ["layer", "layernorm"],
  ["layer_norm", "layernorm"],
  ["layernorm", "layernorm"],
  ["rms", "rmsnorm"],
  ["rms_norm", "rmsnorm"],
  ["rmsnorm", "rmsnorm"]
]);
function readPlacement(r, ctx) {
  const normNode = r.fields.get("norm");
  const firstNode = r.fields.get("norm_first");
  if (normNode && firstNode) {
    ctx.sink.error("config/conflicting-fields", `${displayPath(r.entry.body)} gives both '${r.fields.written("norm")}' and '${r.fields.written("norm_first")}'; keep one of them`, r.fields.keySpan("norm_first") ?? firstNode.span);
    return void 0;
  }
  if (normNode) return readChoice(normNode, ctx, PLACEMENTS, ["pre", "post"]);
  if (firstNode) {
    if (firstNode.kind === "scalar" && typeof firstNode.value === "boolean") return firstNode.value ? "pre" : "post";
    ctx.sink.error("config/type", `${displayPath(firstNode)} must be true or false, got ${firstNode.kind === "scalar" ? String(firstNode.value) : `a ${firstNode.kind === "map" ? "mapping" : "list"}`}`, firstNode.span);
    return void 0;
  }
  return "pre";
}
function readMlp(r, ctx, width) {
  const mlpNode = r.fields.get("mlp");
  const ratioNode = r.fields.get("mlp_ratio");
  if (mlpNode && ratioNode) {
    ctx.sink.error("config/conflicting-fields", `${displayPath(r.entry.body)} gives both '${r.fields.written("mlp")}' and '${r.fields.written("mlp_ratio")}'; give the MLP's width or its ratio, not both`, r.fields.keySpan("mlp_ratio") ?? ratioNode.span);
    return void 0;
  }
  if (mlpNode) {
    const units2 = readPositiveInteger(mlpNode, ctx);
    return units2 === void 0 ? void 0 : { units: units2 };
  }
  let ratio = { value: DEFAULT_MLP_RATIO, span: r.entry.kindSpan, where: `the default mlp_ratio ${DEFAULT_MLP_RATIO} of ${displayPath(r.entry.body)}` };
  if (ratioNode) {
    if (ratioNode.kind !== "scalar" || typeof ratioNode.value !== "number" || !(ratioNode.value > 0) || !Number.isFinite(ratioNode.value)) {
      ctx.sink.error("config/type", `${displayPath(ratioNode)} must be a positive number, got ${ratioNode.kind === "scalar" ? String(ratioNode.value) : `a ${ratioNode.kind === "map" ? "mapping" : "list"}`}`, ratioNode.span);
      return void 0;
    }
    ratio = stated(ratioNode, ratioNode.value);
  }
  if (width === void 0) return { ratio };
  const units = ratio.value * width;
  if (!Number.isSafeInteger(units)) {
    ctx.sink.error("config/mlp-width", `${ratio.where} is ${ratio.value}, and ${ratio.value} × the width ${width} is not a whole number of units; give the MLP's width instead (e.g. mlp: ${Math.max(1, Math.round(units))})`, ratio.span);
    return void 0;
  }
  return { units };
}
function readTransformerBlock(r, ctx) {
  const attention3 = readAttentionFields(r, ctx);
  const widthNode = r.fields.get("width");
  const width = widthNode?.kind === "scalar" && typeof widthNode.value === "number" && Number.isSafeInteger(widthNode.value) && widthNode.value >= 1 ? widthNode.value : void 0;
  const mlp = readMlp(r, ctx, width);
  const placement = readPlacement(r, ctx);
  const typeNode = r.fields.get("norm_type");
  const normWord = typeNode ? readChoice(typeNode, ctx, NORM_TYPES, ["layer", "rms"]) : "layernorm";
  const actNode = r.fields.get("activation");
  const act = actNode ? readActivation(actNode, ctx) : pointwiseOpOf("gelu");
  const depth = optionalPositive(r, "depth", ctx);
  const bias = readBias(r, ctx);
  if (!attention3 || !mlp || !placement || !normWord || act === void 0 || depth === false || !bias) return void 0;
  const at = (part, fields = []) => ({ path: `${r.site.path}/${part}`, span: r.site.span, fieldSpans: r.fields.spans(fields) });
  const made = (part, body, fields = [], more = {}) => ({ body, site: at(part, fields), ...more });
  const norm = (part) => {
    const op = pointwiseOpOf(normWord);
    return made(part, { kind: "pointwise", family: op.family, op: op.op }, ["norm", "norm_first", "norm_type"]);
  };
  const activation = (op) => made("mlp/activation", { kind: "pointwise", family: op.family, op: op.op }, ["activation"]);
  const sum = (part) => made(part, { kind: "merge", mode: "sum", origin: "residual" });
  const attn = made("attention", attention3.body, ["heads", "head_dim", "width", "causal", "mask", "window"], attention3.declared.length > 0 ? { declared: attention3.declared } : {});
  const mlpIn = "units" in mlp ? made("mlp/in", { kind: "dense", units: mlp.units, ...bias }, r.fields.has("mlp") ? ["mlp"] : []) : made("mlp/in", { kind: "dense", units: 0, ...bias }, [], { unitsPerWidth: { ...mlp.ratio, offset: 0 } });
  const back = { value: 1, span: r.entry.kindSpan, where: `the output of ${displayPath(r.entry.body)}`, offset: act ? -2 : -1 };
  const mlpOut = width !== void 0 ? made("mlp/out", { kind: "dense", units: width, ...bias }, ["width"]) : made("mlp/out", { kind: "dense", units: 0, ...bias }, [], { unitsPerWidth: back });
  const mlpPath = [mlpIn, ...act ? [activation(act)] : [], mlpOut];
  const chain2 = (layers) => ({ t: "chain", layers });
  const residual = (main, merge, after) => ({ t: "merge", paths: [[chain2(main)], []], refs: [], merge, after });
  const blocks = placement === "pre" ? [residual([norm("attention/norm"), attn], sum("attention/sum"), []), residual([norm("mlp/norm"), ...mlpPath], sum("mlp/sum"), [])] : [residual([attn], sum("attention/sum"), [norm("attention/norm")]), residual(mlpPath, sum("mlp/sum"), [norm("mlp/norm")])];
  const one = { t: "sequence", body: blocks, ...r.name ? { name: r.name } : {} };
  const depthNode = r.fields.get("depth");
  if (depth === void 0 || !depthNode) return one;
  return { t: "repeat", times: depth, timesSpan: depthNode.span, timesPath: displayPath(depthNode), body: [one] };
}

// src/config/read-blocks.ts
function readRepeat(r, ctx) {
  const hasTimes = requireField(r, "times", "how many copies", ctx);
  const hasLayers = requireField(r, "layers", "the layers to repeat", ctx);
  const timesNode = r.fields.get("times");
  const times = timesNode && readPositiveInteger(timesNode, ctx);
  const layersNode = r.fields.get("layers");
  const body = layersNode && ctx.readList(layersNode, false);
  if (!hasTimes || !hasLayers || !timesNode || times === void 0 || !body) return void 0;
  const timesParams = ctx.paramsOf?.(timesNode) ?? [];
  return {
    t: "repeat",
    times,
    timesSpan: timesNode.span,
    timesPath: displayPath(timesNode),
    ...timesParams.length > 0 ? { timesParams } : {},
    body,
    ...r.name ? { name: r.name } : {}
  };
}
function readSequence(r, ctx) {
  if (!requireField(r, "layers", "the layers, in order", ctx)) return void 0;
  const body = ctx.readList(r.fields.get("layers"), false);
  if (!body) return void 0;
  return { t: "sequence", body, ...r.name ? { name: r.name } : {} };
}
function mergeOf(r, mode, origin) {
  return { body: { kind: "merge", mode, origin }, site: r.site, labelled: true };
}
function block(r, ctx, paths, refs, merge, ok) {
  const after = readShortcutFields(r.fields, ctx);
  if (!ok || !after || !refs || paths.some((p) => p === void 0)) return void 0;
  return { t: "merge", paths, refs, merge, after, ...r.name ? { name: r.name } : {} };
}
function readResidual(r, ctx) {
  const ok = requireField(r, "layers", "the main path, a list of layers", ctx);
  const mainNode = r.fields.get("layers");
  const main = mainNode && ctx.readList(mainNode, false);
  const shortcutNode = r.fields.get("shortcut");
  const shortcut = shortcutNode ? ctx.readPath(shortcutNode) : [];
  return block(r, ctx, [main, shortcut], [], mergeOf(r, "sum", "residual"), ok);
}
var MERGE_MODES2 = /* @__PURE__ */ new Map([
  ["concat", "concat"],
  ["concatenate", "concat"],
  ["cat", "concat"],
  ["sum", "sum"],
  ["add", "sum"]
]);
function readBranches(r, ctx) {
  let ok = requireField(r, "paths", "a list of paths, each a list of layers", ctx);
  const modeNode = r.fields.get("merge");
  const mode = modeNode ? readChoice(modeNode, ctx, MERGE_MODES2, ["concat", "sum"]) : "concat";
  if (!mode) ok = false;
  const pathsNode = r.fields.get("paths");
  const paths = [];
  if (pathsNode) {
    if (pathsNode.kind !== "seq" || pathsNode.items.length < 2) {
      const got = pathsNode.kind === "seq" ? `${pathsNode.items.length} path${pathsNode.items.length === 1 ? "" : "s"}` : "no list";
      ctx.sink.error("config/branches", `${displayPath(pathsNode)} must list at least two paths (each a list of layers; an empty list is the identity), got ${got}`, pathsNode.span);
      ok = false;
    } else {
      for (const p of pathsNode.items) paths.push(ctx.readPath(p));
    }
  }
  return block(r, ctx, paths, [], mergeOf(r, mode ?? "concat", "branches"), ok);
}
function readSkip(r, ctx) {
  const ok = requireField(r, "from", "the name of the earlier layer to merge with", ctx);
  const fromNode = r.fields.get("from");
  const refs = fromNode ? readRefs(fromNode, ctx) : [];
  const mode = r.entry.match.reader === "add" ? "sum" : "concat";
  return block(r, ctx, [[]], refs, mergeOf(r, mode, "skip"), ok);
}
function readRefs(node, ctx) {
  const items = node.kind === "seq" ? node.items : [node];
  if (items.length === 0) {
    ctx.sink.error("config/invalid-value", `${displayPath(node)} is empty; name at least one earlier layer`, node.span);
    return void 0;
  }
  const out = [];
  let ok = true;
  for (const item of items) {
    const m = item.kind === "scalar" && typeof item.value === "string" ? /^([^[\]]+)((?:\[[1-9][0-9]*\])*)$/.exec(item.value) : null;
    if (!m) {
      const got = item.kind === "scalar" ? JSON.stringify(item.value) : `a ${item.kind === "map" ? "mapping" : "list"}`;
      ctx.sink.error("config/invalid-value", `${displayPath(item)} must name an earlier layer ('enc1', or one copy of a repeated layer such as 'down[2]'), got ${got}`, item.span);
      ok = false;
      continue;
    }
    const copies = [...m[2].matchAll(/\[([0-9]+)\]/g)].map((c) => Number(c[1]));
    out.push({ text: m[0], base: m[1], copies, span: item.span, where: displayPath(item) });
  }
  return ok ? out : void 0;
}

// src/config/read-layers.ts
var READERS = {
  conv: readConv,
  conv_transpose: readConvTranspose,
  separable_conv: readSeparableConv,
  pool: readPool,
  upsample: readUpsample,
  dense: readDense,
  flatten: readFlatten,
  recurrent: readRecurrent,
  embedding: readEmbedding,
  position: readPosition,
  class_token: readClassToken,
  attention: readAttention,
  transformer_block: readTransformerBlock,
  pointwise: readPointwise2,
  activation: readActivationLayer,
  repeat: readRepeat,
  sequence: readSequence,
  residual: readResidual,
  branches: readBranches,
  add: readSkip,
  concat: readSkip
};
var SCALAR_BODIES = /* @__PURE__ */ new Set(["activation", "pointwise"]);
var RESERVED = /* @__PURE__ */ new Set(["input"]);
function readLayerList(node, ctx, allowEmpty = false) {
  const rc = {
    ...ctx,
    readList: (n, empty) => readLayerList(n, ctx, empty),
    readPath: (n) => {
      if (n.kind === "seq") return readLayerList(n, ctx, true);
      if (n.kind === "scalar" && n.value === null) return [];
      const one = readLayer(n, rc);
      return one ? [one] : void 0;
    }
  };
  if (node.kind !== "seq") {
    const got = node.kind === "map" ? "a mapping" : node.value === null ? "nothing" : String(node.value);
    ctx.sink.error("config/type", `${displayPath(node)} must be a list of layers, got ${got}`, node.span);
    return void 0;
  }
  if (node.items.length === 0 && !allowEmpty) {
    ctx.sink.error("config/empty-layers", `${displayPath(node)} is empty; list at least one layer`, node.span);
    return void 0;
  }
  let ok = true;
  const out = [];
  for (const item of node.items) {
    const t = readLayer(item, rc);
    if (t) out.push(t);
    else ok = false;
  }
  return ok ? out : void 0;
}
function readLayer(item, ctx) {
  const entry = readLayerEntry(item, ctx.sink);
  if (!entry) return void 0;
  if (entry.scalar && !SCALAR_BODIES.has(entry.match.reader)) {
    const s = entry.scalar;
    ctx.sink.error("config/type", `${displayPath(s)} must be a mapping of the layer's fields, got ${describeValue(s)}; e.g. '- ${entry.kindWritten}: {…}'`, s.span);
    return void 0;
  }
  const fields = new LayerFields(entry.body, entry.fields, fieldsOf(entry.match.reader, entry.match.op?.family), ctx.sink);
  const nameNode = fields.get("name");
  const text = nameNode ? readName(nameNode, ctx) : void 0;
  const fieldParams = ctx.paramsOf ? fields.provenance(ctx.paramsOf) : {};
  const site = { path: pointerOf(item), span: item.span, fieldSpans: fields.spans(), ...Object.keys(fieldParams).length > 0 ? { fieldParams } : {} };
  const read = { entry, fields, site, ...text !== void 0 && nameNode ? { name: { text, span: nameNode.span } } : {} };
  const t = READERS[entry.match.reader](read, ctx);
  return t && fields.ok && (nameNode === void 0 || text !== void 0) ? t : void 0;
}
function readName(node, ctx) {
  const text = readText(node, ctx);
  if (text === void 0) return void 0;
  if (/[[\]]/.test(text) || RESERVED.has(text)) {
    const why = RESERVED.has(text) ? `'${text}' is reserved (it means the model input in 'from')` : "'[' and ']' are kept for the copies a repeat makes (name[1], name[2], …)";
    ctx.sink.error("config/invalid-name", `${displayPath(node)} is '${text}', which cannot name a layer: ${why}`, node.span);
    return void 0;
  }
  return text;
}

// src/config/layer-names.ts
function checkNames(templates, sink) {
  const all = /* @__PURE__ */ new Map();
  collect(templates, all);
  const defs = /* @__PURE__ */ new Map();
  const out = /* @__PURE__ */ new Map();
  let ok = true;
  const define = (name, chain2) => {
    if (!name) return;
    const earlier = defs.get(name.text);
    if (earlier) {
      sink.error(
        "config/duplicate-name",
        `the layer name '${name.text}' is already used on line ${earlier.span.line}; names must be unique in the model (the copies a repeat makes are numbered ${name.text}[1], ${name.text}[2], … by themselves)`,
        name.span
      );
      ok = false;
      return;
    }
    defs.set(name.text, { span: name.span, chain: chain2 });
  };
  const check2 = (ref, chain2) => {
    if (ref.base === "input") {
      if (ref.copies.length > 0) {
        sink.error("config/invalid-copy", `${ref.where}: 'input' is the model input, which has no copies; write 'input'`, ref.span);
        ok = false;
      } else out.set(ref, { input: true });
      return;
    }
    const def = defs.get(ref.base);
    if (!def) {
      ok = false;
      const later = all.get(ref.base);
      if (later) {
        sink.error("config/forward-reference", `${ref.where} names '${ref.base}', which is defined later (line ${later.line}); a merge reads only layers that come before it`, ref.span);
        return;
      }
      const guess = closest(ref.base, [...defs.keys(), "input"]);
      sink.error("config/unknown-name", `${ref.where}: no layer before this one is named '${ref.base}'${guess ? ` (did you mean '${guess}'?)` : ""}; give the layer a 'name' to merge with it`, ref.span);
      return;
    }
    let shared = 0;
    while (shared < def.chain.length && shared < chain2.length && def.chain[shared] === chain2[shared]) shared++;
    const outside = def.chain.slice(shared);
    if (ref.copies.length === 0 && outside.length > 0) {
      const example = `${ref.base}${outside.map((f2) => `[${f2.times}]`).join("")}`;
      const count = outside.reduce((a, f2) => a * f2.times, 1);
      sink.error(
        "config/ambiguous-name",
        `${ref.where}: '${ref.base}' is inside a repeat (line ${outside[0].span.line}) that this merge is outside of, so it names ${count} copies; name one, e.g. '${example}'`,
        ref.span
      );
      ok = false;
      return;
    }
    if (ref.copies.length !== outside.length) {
      const why = outside.length === 0 ? def.chain.length === 0 ? `'${ref.base}' is not inside a repeat` : `inside the repeat that copies it, '${ref.base}' already means the copy of the same iteration` : `'${ref.base}' is inside ${outside.length} repeats that this merge is outside of; give one copy number for each`;
      sink.error("config/invalid-copy", `${ref.where} is '${ref.text}', but ${why}`, ref.span);
      ok = false;
      return;
    }
    const over = ref.copies.findIndex((c, i) => c > outside[i].times);
    if (over >= 0) {
      sink.error("config/invalid-copy", `${ref.where} is '${ref.text}', but the repeat on line ${outside[over].span.line} makes ${outside[over].times} copies`, ref.span);
      ok = false;
      return;
    }
    out.set(ref, { input: false, shared });
  };
  const walk2 = (list2, chain2) => {
    for (const t of list2) {
      switch (t.t) {
        case "chain":
          break;
        case "repeat":
          walk2(t.body, [...chain2, { times: t.times, span: t.timesSpan }]);
          break;
        case "sequence":
          walk2(t.body, chain2);
          break;
        case "merge":
          for (const p of t.paths) walk2(p, chain2);
          for (const r of t.refs) check2(r, chain2);
          break;
      }
      define(t.name, chain2);
    }
  };
  walk2(templates, []);
  return ok ? out : void 0;
}
function collect(list2, into) {
  for (const t of list2) {
    if (t.t === "repeat" || t.t === "sequence") collect(t.body, into);
    if (t.t === "merge") for (const p of t.paths) collect(p, into);
    if (t.name && !into.has(t.name.text)) into.set(t.name.text, t.name.span);
  }
}

// src/config/layer-templates.ts
function expandedCount(templates) {
  let total = 0;
  for (const t of templates) total += countOne(t);
  return total;
}
function countOne(t) {
  switch (t.t) {
    case "chain":
      return t.layers.length;
    case "repeat":
      return t.times * expandedCount(t.body);
    case "sequence":
      return expandedCount(t.body);
    case "merge":
      return t.paths.reduce((a, p) => a + expandedCount(p), 0) + 1 + t.after.length;
  }
}

// src/config/expand-layers.ts
function expandTemplates(templates, refs, listPath, listSpan, sink) {
  const total = expandedCount(templates);
  if (total > MAX_EXPANDED_LAYERS) {
    const amount = Number.isSafeInteger(total) ? `${total} layers` : `more than ${Number.MAX_SAFE_INTEGER} layers`;
    const culprit = biggestRepeat(templates);
    if (culprit) {
      sink.error(
        "config/too-many-layers",
        `${culprit.timesPath} is ${culprit.times}, which makes the model expand to ${amount}; at most ${MAX_EXPANDED_LAYERS} layers are allowed after expanding repeat blocks`,
        culprit.timesSpan
      );
    } else {
      sink.error("config/too-many-layers", `${listPath} has ${amount}; at most ${MAX_EXPANDED_LAYERS} are allowed`, listSpan);
    }
    return void 0;
  }
  return new Expansion(refs).run(templates);
}
function biggestRepeat(templates) {
  let best;
  const visit3 = (list2) => {
    for (const t of list2) {
      if (t.t === "repeat") {
        const count = countOne(t);
        if (!best || count > best.count) best = { count, t };
      } else if (t.t === "sequence") visit3(t.body);
      else if (t.t === "merge") for (const p of t.paths) visit3(p);
    }
  };
  visit3(templates);
  return best?.t;
}
var Expansion = class {
  constructor(refs) {
    this.refs = refs;
  }
  refs;
  out = [];
  pending = /* @__PURE__ */ new Map();
  /** Label → the output layer of the entry that carries it. */
  labels = /* @__PURE__ */ new Map();
  /** Iterations (1-based) of the enclosing repeats, outermost first. */
  iterations = [];
  /** The parameters of the enclosing repeats' counts (in a definition), outermost first. */
  counts = [];
  run(templates) {
    this.list(templates, INPUT);
    return { layers: this.out, pending: this.pending };
  }
  list(templates, input) {
    let cur = input;
    for (const t of templates) cur = this.one(t, cur);
    return cur;
  }
  label(text) {
    return text + this.iterations.map((i) => `[${i}]`).join("");
  }
  make(m, inputs, name) {
    const index = this.out.length;
    const depth = this.iterations.length;
    const fieldParams = withCounts(m.site.fieldParams, this.counts);
    const layer = {
      ...m.body,
      index,
      inputs,
      path: m.site.path,
      span: m.site.span,
      fieldSpans: m.site.fieldSpans,
      ...name !== void 0 && m.labelled ? { name } : {},
      ...depth > 0 ? { repeatIteration: this.iterations[depth - 1] - 1 } : {},
      ...fieldParams ? { fieldParams } : {}
    };
    this.out.push(layer);
    if (m.declared || m.unitsPerWidth || m.vocabulary) {
      this.pending.set(index, { ...m.declared ? { declared: m.declared } : {}, ...m.unitsPerWidth ? { unitsPerWidth: m.unitsPerWidth } : {}, ...m.vocabulary ? { vocabulary: m.vocabulary } : {} });
    }
    return index;
  }
  chain(layers, input, name) {
    let cur = input;
    for (const m of layers) cur = this.make(m, [cur], name);
    return cur;
  }
  /** Records the entry's label; a block's output layer takes it when it has no label of its own. */
  register(text, output, adopt) {
    if (text === void 0) return;
    const label = this.label(text);
    this.labels.set(label, output);
    const layer = this.out[output];
    if (adopt && layer && layer.name === void 0) this.out[output] = { ...layer, name: label };
  }
  one(t, input) {
    const name = t.name ? this.label(t.name.text) : void 0;
    switch (t.t) {
      case "chain": {
        const out = this.chain(t.layers, input, name);
        this.register(t.name?.text, out, false);
        return out;
      }
      case "repeat": {
        let cur = input;
        this.counts.push(t.timesParams ?? []);
        for (let i = 1; i <= t.times; i++) {
          this.iterations.push(i);
          cur = this.list(t.body, cur);
          this.iterations.pop();
        }
        this.counts.pop();
        this.register(t.name?.text, cur, true);
        return cur;
      }
      case "sequence": {
        const out = this.list(t.body, input);
        this.register(t.name?.text, out, true);
        return out;
      }
      case "merge": {
        const ins = t.paths.map((p) => this.list(p, input));
        for (const r of t.refs) ins.push(this.resolve(r));
        const merged = this.make(t.merge, ins, name);
        const out = this.chain(t.after, merged, void 0);
        this.register(t.name?.text, out, false);
        return out;
      }
    }
  }
  resolve(ref) {
    const how = this.refs.get(ref);
    if (!how) throw new Error(`layer expansion: the reference '${ref.text}' was not checked (a loader bug)`);
    if (how.input) return INPUT;
    const label = ref.base + this.iterations.slice(0, how.shared).map((i) => `[${i}]`).join("") + ref.copies.map((c) => `[${c}]`).join("");
    const at = this.labels.get(label);
    if (at === void 0) throw new Error(`layer expansion: '${label}' has no layer (a loader bug)`);
    return at;
  }
};
function withCounts(own, counts) {
  const around = [];
  for (const list2 of counts) for (const p of list2) if (!around.some((q) => q.name === p.name)) around.push(p);
  if (around.length === 0) return own;
  return { ...own, layer: around };
}

// src/config/resolve-pending.ts
function resolvePending(model, pending, sink) {
  if (pending.size === 0) return model;
  const input = resolveVocabulary(model, pending, sink);
  if (!input) return void 0;
  const withInput = { ...model, input };
  if (![...pending.values()].some((p) => p.declared || p.unitsPerWidth)) return withInput;
  const layers = [];
  const inputWidths = [];
  const shapes = inferShapes(withInput, (layer, shape) => {
    inputWidths.push(shape.width);
    const p = pending.get(layer.index);
    const out = p ? adjust(layer, shape, p, inputWidths) : layer;
    if (!("code" in out)) layers.push(out);
    return out;
  });
  if (!shapes.ok) {
    for (const d of shapes.diagnostics) sink.error(d.code, d.message, d.span);
    return void 0;
  }
  return { ...withInput, layers };
}
function resolveVocabulary(model, pending, sink) {
  let input = model.input;
  let from;
  let ok = true;
  for (const [index, p] of pending) {
    const v = p.vocabulary;
    if (!v) continue;
    const layer = model.layers[index];
    if (layer.inputs[0] !== INPUT) {
      const reads = model.layers[layer.inputs[0]];
      sink.error(
        "config/embedding-vocabulary",
        `${v.where} is given on layer ${layerLabel(layer)}, which reads layer ${layerLabel(reads)} (line ${reads.span.line}), not the input: only an embedding that reads the token input has one row per token`,
        v.span
      );
      ok = false;
      continue;
    }
    const known = input.vocabulary;
    if (known === void 0) {
      for (const field of ["representation", "channels"]) {
        if (input[field] === void 0) continue;
        sink.error(
          "config/conflicting-fields",
          `${v.where} makes the input a sequence of ${v.value} tokens, but model.input gives ${field === "channels" ? "channels" : "a representation"} (line ${input.fieldSpans[field]?.line ?? input.span.line}): ${field === "channels" ? "a token position holds one token, not channels" : "a token position supports exactly its V indicator functions, so M = V"}; drop it`,
          v.span
        );
        ok = false;
      }
      input = { ...input, vocabulary: v.value, fieldSpans: { ...input.fieldSpans, vocabulary: v.span } };
      from = v;
    } else if (known !== v.value) {
      const said = from ? `${from.where} (line ${from.span.line})` : `model.input (line ${input.fieldSpans["vocabulary"]?.line ?? input.span.line})`;
      sink.error("config/vocabulary-mismatch", `${v.where} is ${v.value}, but ${said} gives a vocabulary of ${known} tokens; a token embedding has one row per token, so they must agree`, v.span);
      ok = false;
    }
  }
  return ok ? input : void 0;
}
function adjust(layer, shape, p, inputWidths) {
  for (const d of p.declared ?? []) {
    const problem = check(layer, shape, d);
    if (problem) return problem;
  }
  const factor = p.unitsPerWidth;
  if (!factor || layer.kind !== "dense") return layer;
  const width = inputWidths[layer.index + factor.offset];
  const units = factor.value * width;
  if (!Number.isSafeInteger(units) || units < 1) {
    return {
      code: "config/mlp-width",
      message: `${factor.where} is ${factor.value}, and ${factor.value} × the width ${width} is not a whole number of units; give the MLP's width instead (e.g. mlp: ${Math.max(1, Math.round(units))})`,
      span: factor.span
    };
  }
  return { ...layer, units };
}
function check(layer, shape, d) {
  const where2 = `layer ${layerLabel(layer)}`;
  switch (d.against) {
    case "input-width":
      if (d.value === shape.width) return void 0;
      return { code: "config/width-mismatch", message: `${d.where} is ${d.value}, but ${where2} reads vectors of width ${shape.width}; it must equal the width of the layer's input`, span: d.span };
    case "head-width": {
      if (layer.kind !== "attention") return void 0;
      const a = layer.headDim ?? shape.width / layer.heads;
      if (d.value === a) return void 0;
      return { code: "config/width-mismatch", message: `${d.where} is ${d.value}, but the heads of ${where2} are ${a} wide (queries, keys and values have one head width here); drop it or make it equal`, span: d.span };
    }
    case "positions": {
      const n = positionCount(shape.shape);
      if (d.value >= n) return void 0;
      return { code: "config/too-few-positions", message: `${d.where} is ${d.value}, but ${where2} reads ${n} positions; the table needs a vector for every position`, span: d.span };
    }
  }
}

// src/config/build-layered.ts
function buildLayeredModel(root, file, sink, paramsOf) {
  const inputNode = asMap(fieldOf(root, "input"));
  const input = readInput(inputNode, sink, paramsOf);
  const output = readOutput(asMap(fieldOf(root, "output")));
  const ws = fieldOf(root, "weight_sharing");
  const weightSharing = ws === void 0 ? true : booleanOf(ws);
  const shapeNode = inputNode ? fieldOf(inputNode, "shape") : void 0;
  const ctx = {
    sink,
    dims: input?.shape.length,
    shapeText: input ? `[${input.shape.join(", ")}]` : "",
    shapePath: shapeNode ? displayPath(shapeNode) : "the input shape",
    ...paramsOf ? { paramsOf } : {}
  };
  const layersNode = fieldOf(root, "layers");
  const templates = layersNode ? readLayerList(layersNode, ctx) : void 0;
  const refs = templates && checkNames(templates, sink);
  if (!input || !output || weightSharing === void 0 || !templates || !refs || !layersNode) return void 0;
  const expanded = expandTemplates(templates, refs, displayPath(layersNode), layersNode.span, sink);
  if (!expanded) return void 0;
  const model = { kind: "layered", file, input, weightSharing, layers: expanded.layers, output, span: root.span };
  return resolvePending(model, expanded.pending, sink);
}

// src/config/diagnostic-sink.ts
var DiagnosticSink = class {
  constructor(file) {
    this.file = file;
  }
  file;
  items = [];
  seen = /* @__PURE__ */ new Set();
  error(code, message, span) {
    const key = span ? `${code}\0${span.offset}\0${span.endOffset}` : `${code}\0${message}`;
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.items.push(span ? { code, message, file: this.file, span, severity: "error" } : { code, message, file: this.file, severity: "error" });
  }
  get count() {
    return this.items.length;
  }
  /** Sorted by offset (position-less ones first), then by end, code and message; capped. */
  sorted() {
    const all = [...this.items].sort(
      (a, b) => (a.span?.offset ?? -1) - (b.span?.offset ?? -1) || (a.span?.endOffset ?? -1) - (b.span?.endOffset ?? -1) || compare2(a.code, b.code) || compare2(a.message, b.message)
    );
    if (all.length <= MAX_DIAGNOSTICS_PER_FILE) return all;
    const next = all[MAX_DIAGNOSTICS_PER_FILE];
    const more = all.length - MAX_DIAGNOSTICS_PER_FILE;
    const message = `and ${more.toLocaleString("en-US")} more problem${more === 1 ? "" : "s"} in this file from here on, not listed (only the first ${MAX_DIAGNOSTICS_PER_FILE} are); fix these and run again`;
    const summary = next.span ? { code: "input/more-problems", message, file: this.file, span: next.span, severity: "error" } : { code: "input/more-problems", message, file: this.file, severity: "error" };
    return [...all.slice(0, MAX_DIAGNOSTICS_PER_FILE), summary];
  }
};
function compare2(a, b) {
  return a < b ? -1 : a > b ? 1 : 0;
}

// src/config/field-aliases.ts
var INPUT_ALIASES = /* @__PURE__ */ new Map([
  ["features", "channels"],
  ["in_channels", "channels"],
  ["num_channels", "channels"],
  ["vocab_size", "vocabulary"],
  ["vocabulary_size", "vocabulary"],
  ["vocab", "vocabulary"],
  ["num_tokens", "vocabulary"],
  ["n_vocab", "vocabulary"],
  ["ntoken", "vocabulary"]
]);
var INPUT_FIELDS = ["shape", "channels", "representation", "vocabulary"];
function normaliseFieldAliases(root, sink) {
  if (root.kind !== "map") return;
  const input = fieldOf(root, "input");
  if (input?.kind === "map") normaliseBody(input, INPUT_FIELDS, INPUT_ALIASES, sink);
}
function normaliseBody(body, fields, aliases, sink) {
  const bySpelling = /* @__PURE__ */ new Map();
  for (const f2 of fields) bySpelling.set(normaliseWord(f2), f2);
  for (const [alias, canonical] of aliases) bySpelling.set(normaliseWord(alias), canonical);
  const byCanonical = /* @__PURE__ */ new Map();
  for (const entry of body.entries) {
    const canonical = bySpelling.get(normaliseWord(entry.key)) ?? entry.key;
    const group = byCanonical.get(canonical) ?? [];
    group.push(entry);
    byCanonical.set(canonical, group);
  }
  const dropped = /* @__PURE__ */ new Set();
  for (const [canonical, group] of byCanonical) {
    const first = group[0];
    if (!first) continue;
    first.key = canonical;
    for (const extra of group.slice(1)) {
      dropped.add(extra);
      const spellings = group.map((e) => `'${e.writtenKey}'`);
      const listed = spellings.length === 2 ? `${spellings.join(" and ")}, which both mean` : `${spellings.join(", ")}, which all mean`;
      sink.error("config/alias-conflict", `${displayPath(body)} gives ${listed} '${canonical}'; keep only one of them`, extra.keySpan);
    }
  }
  if (dropped.size > 0) {
    const kept = body.entries.filter((e) => !dropped.has(e));
    body.entries.splice(0, body.entries.length, ...kept);
  }
}

// src/config/definition-source.ts
import { dirname as dirname2, posix, relative as relative2, resolve as resolve2, sep as sep2 } from "node:path";

// src/files/repo-root.ts
import { existsSync } from "node:fs";
import { dirname, join, relative, resolve, sep } from "node:path";
function findRepoRoot(start) {
  let dir = resolve(start);
  for (; ; ) {
    if (existsSync(join(dir, ".git"))) return dir;
    const up = dirname(dir);
    if (up === dir) return resolve(start);
    dir = up;
  }
}
function toRootRelative(root, path) {
  return relative(root, resolve(path)).split(sep).join("/");
}

// src/files/work-tree.ts
import { closeSync, constants, fstatSync, lstatSync, openSync, readFileSync } from "node:fs";
import { join as join2 } from "node:path";

// src/files/file-read.ts
function refused(code, message) {
  return { kind: "refused", code, message };
}

// src/files/work-tree.ts
function inspectWorkTree(root, rel) {
  const segments = rel.split("/").filter((s) => s !== "" && s !== ".");
  if (segments.length === 0 || segments.includes("..") || /^[A-Za-z]:/.test(rel) || rel.startsWith("/")) return { kind: "absent" };
  for (let i = 1; i <= segments.length; i++) {
    const sub2 = segments.slice(0, i).join("/");
    let s;
    try {
      s = lstatSync(join2(root, sub2));
    } catch {
      return { kind: "absent" };
    }
    if (s.isSymbolicLink()) return { kind: "symlink", link: sub2 };
    if (i < segments.length && !s.isDirectory()) return { kind: "absent" };
    if (i === segments.length) {
      if (s.isFile()) return { kind: "file", size: s.size };
      return s.isDirectory() ? { kind: "directory" } : { kind: "special" };
    }
  }
  return { kind: "absent" };
}
function readWorkTree(root, rel) {
  const entry = inspectWorkTree(root, rel);
  switch (entry.kind) {
    case "absent":
      return { kind: "absent" };
    case "symlink":
      return refused("symlink", symlinkMessage(rel, entry.link));
    case "directory":
      return refused("directory", `${rel} is a directory, not a file`);
    case "special":
      return refused("special", `${rel} is not a regular file`);
    case "file":
      break;
  }
  if (entry.size > MAX_DOCUMENT_BYTES) {
    return refused("too-large", `${rel} is ${entry.size} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
  }
  let fd;
  try {
    fd = openSync(join2(root, rel), constants.O_RDONLY | (constants.O_NOFOLLOW ?? 0));
    const s = fstatSync(fd);
    if (!s.isFile()) return refused("special", `${rel} is not a regular file`);
    if (s.size > MAX_DOCUMENT_BYTES) return refused("too-large", `${rel} is ${s.size} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
    return { kind: "file", text: readFileSync(fd, "utf8") };
  } catch (err) {
    const code = err.code;
    if (code === "ENOENT") return { kind: "absent" };
    if (code === "ELOOP") return refused("symlink", symlinkMessage(rel, rel));
    return refused("unreadable", `cannot read ${rel}: ${err.message}`);
  } finally {
    if (fd !== void 0) closeSync(fd);
  }
}
function symlinkMessage(rel, link) {
  const where2 = link === rel ? `${rel} is a symbolic link` : `${rel} lies behind the symbolic link ${link}`;
  return `${where2}; links are never followed (they could lead outside the repository), point the check at the file itself`;
}

// src/config/definition-source.ts
function resolveDefinitionPath(written, configRel) {
  if (written.startsWith("/") || /^[A-Za-z]:/.test(written) || written.includes("\\")) {
    return {
      ok: false,
      code: "config/architecture-outside-root",
      message: `architecture '${written}' is not a path relative to the config; write it from the config's directory with forward slashes (e.g. ../arch/residual.yaml), inside the repository`
    };
  }
  const rel = posix.normalize(posix.join(posix.dirname(configRel), written));
  if (rel === ".." || rel.startsWith("../") || rel === "." || rel === "") {
    return {
      ok: false,
      code: "config/architecture-outside-root",
      message: `architecture '${written}' points outside the repository root; a config may only use definitions inside the repository`
    };
  }
  return { ok: true, rel };
}
function workTreeDefinitions(root, cwd = process.cwd()) {
  return {
    read: (rel) => readWorkTree(root, rel),
    display: (rel) => relative2(cwd, resolve2(root, rel)).split(sep2).join("/") || rel
  };
}
function repositoryOf(file) {
  const root = findRepoRoot(dirname2(resolve2(file)));
  return { root, configRel: toRootRelative(root, file) };
}

// src/config/definition-document.ts
var import_yaml4 = __toESM(require_dist(), 1);

// src/config/expression.ts
var MAX_EXPRESSION_LENGTH = 500;
var MAX_EXPRESSION_DEPTH = 32;
var MAX_EXPONENT = 64;
var FUNCTIONS = /* @__PURE__ */ new Map([
  ["ceil", { min: 1, max: 1 }],
  ["floor", { min: 1, max: 1 }],
  ["min", { min: 2, max: 16 }],
  ["max", { min: 2, max: 16 }]
]);
function isExpressionText(value) {
  return typeof value === "string" && value.startsWith("=");
}
var OPERATORS = { "+": "+", "-": "-", "−": "-", "*": "*", "×": "*", "/": "/", "÷": "/", "^": "^", "(": "(", ")": ")", "[": "[", "]": "]", ",": "," };
var Fail = class extends Error {
  constructor(problem) {
    super(problem.message);
    this.problem = problem;
  }
  problem;
};
function fail(code, message, start, end) {
  throw new Fail({ code, message, start, end: Math.max(end, start + 1) });
}
function tokenize(text) {
  const out = [];
  let i = 1;
  while (i < text.length) {
    const c = text[i];
    if (/\s/.test(c)) {
      i++;
      continue;
    }
    const num = /^(?:[0-9]+(?:\.[0-9]+)?|\.[0-9]+)/.exec(text.slice(i));
    if (num) {
      const after = text[i + num[0].length];
      if (after !== void 0 && /[A-Za-z_.0-9]/.test(after)) fail("definition/expression-syntax", `'${text.slice(i, i + num[0].length + 1)}' is not a number; write decimals as 0.5`, i, i + num[0].length + 1);
      out.push({ k: "num", text: num[0], start: i, end: i + num[0].length });
      i += num[0].length;
      continue;
    }
    const name = /^[A-Za-z_][A-Za-z0-9_]*/.exec(text.slice(i));
    if (name) {
      out.push({ k: "name", text: name[0], start: i, end: i + name[0].length });
      i += name[0].length;
      continue;
    }
    const op = OPERATORS[c];
    if (op !== void 0) {
      out.push({ k: "op", text: op, start: i, end: i + 1 });
      i++;
      continue;
    }
    fail("definition/expression-syntax", `'${c}' has no meaning in an expression; it reads numbers, parameter names, + - * / ^, ( ), [ ] and ceil, floor, min, max`, i, i + 1);
  }
  out.push({ k: "end", text: "", start: text.length, end: text.length });
  return out;
}
var Parser = class {
  constructor(text, tokens) {
    this.text = text;
    this.tokens = tokens;
  }
  text;
  tokens;
  at = 0;
  depth = 0;
  parse() {
    if (this.peek().k === "end") fail("definition/expression-syntax", "the expression is empty; write a value after '=', e.g. '=ceil(64 * width)'", 0, this.text.length);
    const e = this.additive();
    const t = this.peek();
    if (t.k !== "end") fail("definition/expression-syntax", `unexpected '${t.text}' after a complete expression`, t.start, t.end);
    return e;
  }
  peek() {
    return this.tokens[this.at];
  }
  next() {
    return this.tokens[this.at++];
  }
  isOp(text) {
    const t = this.peek();
    return t.k === "op" && t.text === text;
  }
  expect(text, what) {
    const t = this.peek();
    if (t.k === "op" && t.text === text) return this.next();
    const got = t.k === "end" ? "the end of the expression" : `'${t.text}'`;
    return fail("definition/expression-syntax", `expected '${text}' ${what}, got ${got}`, t.start, t.end);
  }
  deeper(start, f2) {
    if (++this.depth > MAX_EXPRESSION_DEPTH) {
      fail("definition/expression-limit", `the expression is nested more than ${MAX_EXPRESSION_DEPTH} levels deep here; split it or simplify it`, start, start + 1);
    }
    try {
      return f2();
    } finally {
      this.depth--;
    }
  }
  additive() {
    let left = this.multiplicative();
    while (this.isOp("+") || this.isOp("-")) {
      const op = this.next();
      const right = this.multiplicative();
      left = { t: "bin", op: op.text, left, right, opStart: op.start, start: left.start, end: right.end };
    }
    return left;
  }
  multiplicative() {
    let left = this.unary();
    while (this.isOp("*") || this.isOp("/")) {
      const op = this.next();
      const right = this.unary();
      left = { t: "bin", op: op.text, left, right, opStart: op.start, start: left.start, end: right.end };
    }
    return left;
  }
  unary() {
    const t = this.peek();
    if (t.k === "op" && (t.text === "-" || t.text === "+")) {
      this.next();
      const operand = this.deeper(t.start, () => this.unary());
      return t.text === "-" ? { t: "neg", operand, start: t.start, end: operand.end } : operand;
    }
    return this.power();
  }
  power() {
    const base = this.primary();
    if (!this.isOp("^")) return base;
    const op = this.next();
    const exponent = this.deeper(op.start, () => this.unary());
    return { t: "bin", op: "^", left: base, right: exponent, opStart: op.start, start: base.start, end: exponent.end };
  }
  primary() {
    const t = this.next();
    if (t.k === "num") {
      let value;
      try {
        value = parseDecimal(t.text);
      } catch (e) {
        if (e instanceof OverflowError) fail("definition/overflow", `${t.text} is beyond 2^63; numbers in expressions must stay below it`, t.start, t.end);
        throw e;
      }
      if (!value) fail("definition/expression-syntax", `'${t.text}' is not a number`, t.start, t.end);
      return { t: "num", value, start: t.start, end: t.end };
    }
    if (t.k === "name") {
      if (this.isOp("(")) return this.deeper(t.start, () => this.call(t));
      if (this.isOp("[")) {
        return this.deeper(t.start, () => {
          this.next();
          const index = this.additive();
          const close = this.expect("]", "to close the index");
          return { t: "index", list: { name: t.text, start: t.start, end: t.end }, index, start: t.start, end: close.end };
        });
      }
      if (FUNCTIONS.has(t.text)) fail("definition/expression-syntax", `${t.text} is a function; call it with its arguments in parentheses, e.g. ${t.text}(…)`, t.start, t.end);
      return { t: "name", name: t.text, start: t.start, end: t.end };
    }
    if (t.k === "op" && t.text === "(") {
      return this.deeper(t.start, () => {
        const inner = this.additive();
        const close = this.expect(")", "to close the parenthesis");
        return { ...inner, start: t.start, end: close.end };
      });
    }
    const got = t.k === "end" ? "the end of the expression" : `'${t.text}'`;
    return fail("definition/expression-syntax", `expected a number, a parameter name or '(', got ${got}`, t.start, t.end);
  }
  call(name) {
    const spec = FUNCTIONS.get(name.text);
    if (!spec) {
      const guess = closest(name.text, [...FUNCTIONS.keys()]);
      fail("definition/expression-syntax", `'${name.text}' is not a function${guess ? ` (did you mean '${guess}'?)` : ""}; the functions are ceil, floor, min and max`, name.start, name.end);
    }
    this.next();
    const args = [];
    if (!this.isOp(")")) {
      args.push(this.additive());
      while (this.isOp(",")) {
        this.next();
        args.push(this.additive());
      }
    }
    const close = this.expect(")", `to close ${name.text}(`);
    if (args.length < spec.min || args.length > spec.max) {
      const wanted = spec.min === spec.max ? `${spec.min} argument` : `${spec.min} to ${spec.max} arguments`;
      fail("definition/expression-syntax", `${name.text} takes ${wanted}, got ${args.length}`, name.start, close.end);
    }
    return { t: "call", fn: name.text, args, start: name.start, end: close.end };
  }
};
function parseExpression(text) {
  if (text.length > MAX_EXPRESSION_LENGTH) {
    return { ok: false, error: { code: "definition/expression-limit", message: `the expression is ${text.length} characters long; at most ${MAX_EXPRESSION_LENGTH} are read`, start: 0, end: text.length } };
  }
  try {
    return { ok: true, expr: new Parser(text, tokenize(text)).parse() };
  } catch (e) {
    if (e instanceof Fail) return { ok: false, error: e.problem };
    throw e;
  }
}
function evaluateExpression(expr, values) {
  const used = [];
  const lookup = (name, start, end) => {
    const v = values.get(name);
    if (v === void 0) {
      const guess = closest(name, [...values.keys()]);
      const known = values.size > 0 ? `; the parameters are ${[...values.keys()].join(", ")}` : "; the definition declares no parameters";
      fail("definition/unknown-parameter", `'${name}' is not a parameter of this definition${guess ? ` (did you mean '${guess}'?)` : ""}${known}`, start, end);
    }
    if (!used.includes(name)) used.push(name);
    return v;
  };
  const guarded = (f2, start, end, what) => {
    try {
      return f2();
    } catch (e) {
      if (e instanceof OverflowError) fail("definition/overflow", `${what} overflows: ${e.message}; values in expressions must stay below 2^63 (numerator and denominator)`, start, end);
      throw e;
    }
  };
  const value = (e) => {
    switch (e.t) {
      case "num":
        return e.value;
      case "name": {
        const v = lookup(e.name, e.start, e.end);
        if (isList(v)) fail("definition/expression-type", `'${e.name}' is a list; pick one entry, e.g. ${e.name}[0]`, e.start, e.end);
        return v;
      }
      case "index": {
        const list2 = lookup(e.list.name, e.list.start, e.list.end);
        if (!isList(list2)) fail("definition/expression-type", `'${e.list.name}' is a number, not a list; it cannot be indexed`, e.list.start, e.list.end);
        const i = value(e.index);
        if (!isInteger(i) || i.n < 0n || i.n >= BigInt(list2.length)) {
          fail("definition/index", `index ${formatExact(i)} is outside ${e.list.name}, which has ${list2.length} entr${list2.length === 1 ? "y" : "ies"} (indices 0 to ${list2.length - 1})`, e.index.start, e.index.end);
        }
        return list2[Number(i.n)];
      }
      case "neg":
        return neg(value(e.operand));
      case "call":
        return callOf(e.fn, e.args.map(value));
      case "bin": {
        const l = value(e.left);
        const r = value(e.right);
        switch (e.op) {
          case "+":
            return guarded(() => add(l, r), e.start, e.end, "this sum");
          case "-":
            return guarded(() => sub(l, r), e.start, e.end, "this difference");
          case "*":
            return guarded(() => mul(l, r), e.start, e.end, "this product");
          case "/":
            if (isZero(r)) fail("definition/division-by-zero", `division by zero: ${describe2(e.right)} is 0 here`, e.right.start, e.right.end);
            return guarded(() => div(l, r), e.start, e.end, "this quotient");
          case "^": {
            if (!isInteger(r) || r.n > BigInt(MAX_EXPONENT) || r.n < -BigInt(MAX_EXPONENT)) {
              fail("definition/expression-type", `the exponent is ${formatExact(r)}; it must be an integer from -${MAX_EXPONENT} to ${MAX_EXPONENT}`, e.right.start, e.right.end);
            }
            if (isZero(l) && r.n < 0n) fail("definition/division-by-zero", "division by zero: 0 to a negative power", e.start, e.end);
            return guarded(() => pow(l, Number(r.n)), e.start, e.end, "this power");
          }
        }
      }
    }
  };
  try {
    return { ok: true, value: value(expr), used };
  } catch (err) {
    if (err instanceof Fail) return { ok: false, error: err.problem };
    throw err;
  }
}
function callOf(fn, args) {
  switch (fn) {
    case "ceil":
      return ceil(args[0]);
    case "floor":
      return floor(args[0]);
    case "min":
      return args.reduce((a, b) => compare(b, a) < 0 ? b : a);
    case "max":
      return args.reduce((a, b) => compare(b, a) > 0 ? b : a);
  }
}
function isList(v) {
  return Array.isArray(v);
}
function describe2(e) {
  switch (e.t) {
    case "num":
      return formatExact(e.value);
    case "name":
      return e.name;
    default:
      return "the divisor";
  }
}
function namesOf(expr) {
  const out = [];
  const visit3 = (e) => {
    switch (e.t) {
      case "num":
        return;
      case "name":
        if (!out.includes(e.name)) out.push(e.name);
        return;
      case "index":
        if (!out.includes(e.list.name)) out.push(e.list.name);
        visit3(e.index);
        return;
      case "neg":
        visit3(e.operand);
        return;
      case "bin":
        visit3(e.left);
        visit3(e.right);
        return;
      case "call":
        e.args.forEach(visit3);
        return;
    }
  };
  visit3(expr);
  return out;
}

// src/config/model-schema.ts
import { createHash } from "node:crypto";
import { existsSync as existsSync2, readFileSync as readFileSync2 } from "node:fs";
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";

// src/config/schema-options.ts
var AJV_OPTIONS = { allErrors: true, strict: true, verbose: true, allowUnionTypes: true };
function validatorFileName(schemaFile) {
  return schemaFile.replace(/\.json$/, ".cjs");
}

// src/config/model-schema.ts
var CANDIDATE_DIRS = ["../../schema/", "../schema/"];
var VALIDATOR_DIRS = ["../validators/", "../../build/validators/"];
var MODEL_SCHEMA = "model.schema.json";
var require2 = createRequire(import.meta.url);
var cached = /* @__PURE__ */ new Map();
var compiler = (schema) => {
  const { Ajv } = require2("ajv");
  return new Ajv({ ...AJV_OPTIONS }).compile(schema);
};
function schemaFilePath(name) {
  for (const dir of CANDIDATE_DIRS) {
    const path = fileURLToPath(new URL(dir + name, import.meta.url));
    if (existsSync2(path)) return path;
  }
  const looked = CANDIDATE_DIRS.map((dir) => dir + name).join(" and ");
  throw new Error(`${name} not found (looked for ${looked} relative to ${import.meta.url}); the installation is incomplete`);
}
function schemaTextHash(text) {
  return createHash("sha256").update(text).digest("hex");
}
function precompiled(name, hash) {
  for (const dir of VALIDATOR_DIRS) {
    const path = fileURLToPath(new URL(dir + validatorFileName(name), import.meta.url));
    if (!existsSync2(path)) continue;
    const mod = require2(path);
    return mod.sourceHash === hash && mod.schemaRoots ? mod : void 0;
  }
  return void 0;
}
function pairObjects(copy, loaded, into) {
  if (copy === null || typeof copy !== "object" || loaded === null || typeof loaded !== "object") return;
  if (!Array.isArray(copy)) into.set(copy, loaded);
  for (const [k, v] of Object.entries(copy)) pairObjects(v, loaded[k], into);
}
function compiledSchemaFile(name) {
  const hit = cached.get(name);
  if (hit) return hit;
  const text = readFileSync2(schemaFilePath(name), "utf8");
  const schema = JSON.parse(text);
  const locations = /* @__PURE__ */ new Map();
  const objects = /* @__PURE__ */ new Map();
  const walk2 = (node, at) => {
    if (node === null || typeof node !== "object") return;
    if (!Array.isArray(node)) {
      locations.set(node, at);
      objects.set(at, node);
    }
    for (const [k, v] of Object.entries(node)) walk2(v, `${at}/${k}`);
  };
  walk2(schema, "");
  const pre = precompiled(name, schemaTextHash(text));
  let validate;
  if (pre) {
    const same3 = /* @__PURE__ */ new Map();
    for (const [copy, at] of pre.schemaRoots) pairObjects(copy, objects.get(at), same3);
    const rebind = (e) => e.parentSchema && same3.has(e.parentSchema) ? { ...e, parentSchema: same3.get(e.parentSchema) } : e;
    validate = ((data) => {
      const ok = pre(data);
      validate.errors = ok ? null : (pre.errors ?? []).map(rebind);
      return ok;
    });
  } else validate = compiler(schema);
  const compiled = { schema, validate, locations, origin: pre ? "precompiled" : "runtime" };
  cached.set(name, compiled);
  return compiled;
}
function compiledModelSchema() {
  return compiledSchemaFile(MODEL_SCHEMA);
}
function validateAgainstSchema(value) {
  const { validate } = compiledModelSchema();
  return validate(value) ? [] : [...validate.errors ?? []];
}

// src/config/schema-errors.ts
var MODEL_EITHER_OR = "/allOf/1/else";
var MODEL_NOT_BOTH = "/allOf/1/then";
var LAYER_LIST = "/definitions/layerList";
var INPUT2 = "/definitions/input";
function reportSchemaErrors(errors, root, locations, sink) {
  const typeErrorAt = new Set(errors.filter((e) => e.keyword === "type").map((e) => e.instancePath));
  const suggested = /* @__PURE__ */ new Set();
  for (const e of errors) {
    if (e.keyword !== "additionalProperties") continue;
    const guess = suggestionFor(e, locations);
    if (guess) suggested.add(`${e.instancePath}\0${guess}`);
  }
  const requiredGroups = /* @__PURE__ */ new Map();
  for (const e of errors) {
    if (e.keyword === "if") continue;
    if (e.keyword !== "type" && typeErrorAt.has(e.instancePath)) continue;
    if (e.keyword === "required") {
      if (suggested.has(`${e.instancePath}\0${String(e.params["missingProperty"])}`)) continue;
      const key = `${e.instancePath}\0${where(e, locations)}`;
      const group = requiredGroups.get(key) ?? [];
      group.push(e);
      requiredGroups.set(key, group);
      continue;
    }
    reportOne(e, root, locations, sink);
  }
  for (const group of requiredGroups.values()) reportRequired(group, root, locations, sink);
}
function where(e, locations) {
  return e.parentSchema ? locations.get(e.parentSchema) : void 0;
}
function segmentsOf(instancePath) {
  if (instancePath === "") return [];
  return instancePath.slice(1).split("/").map((s) => s.replace(/~1/g, "/").replace(/~0/g, "~"));
}
function reportOne(e, root, locations, sink) {
  const node = locate(root, segmentsOf(e.instancePath)) ?? root;
  const path = displayPath(node);
  const loc = where(e, locations);
  const parent = e.parentSchema ?? {};
  const params = e.params;
  const at = node.span;
  switch (e.keyword) {
    case "type": {
      const isNumber = typeof e.data === "number";
      const code = isNumber && typeIncludes(parent, "integer") ? "config/invalid-number" : "config/type";
      sink.error(code, `${path} must be ${expected(parent, loc)}, got ${describeScalar(e.data)}`, at);
      return;
    }
    case "minimum":
    case "exclusiveMinimum":
    case "maximum":
    case "exclusiveMaximum": {
      const limit = Number(params["limit"]);
      const noun = typeIncludes(parent, "integer") ? "integer" : "number";
      const what = e.keyword === "minimum" && limit === 1 && noun === "integer" ? "a positive integer" : e.keyword === "minimum" && limit === 0 ? `a non-negative ${noun}` : `${params["comparison"] ?? ""} ${limit}`.trim();
      sink.error("config/invalid-number", `${path} must be ${what}, got ${describeScalar(e.data)}`, at);
      return;
    }
    case "enum": {
      const allowed = (Array.isArray(e.schema) ? e.schema : []).map(String);
      const guess = typeof e.data === "string" ? closest(e.data, allowed) : void 0;
      sink.error(
        "config/invalid-value",
        `${path} must be one of ${allowed.map((a) => `'${a}'`).join(", ")}, got ${describeScalar(e.data)}${guess ? ` (did you mean '${guess}'?)` : ""}`,
        at
      );
      return;
    }
    case "const":
      sink.error("config/invalid-value", `${path} must be ${JSON.stringify(e.schema)}, got ${describeScalar(e.data)}`, at);
      return;
    case "minLength":
      sink.error("config/invalid-value", `${path} must be a non-empty string`, at);
      return;
    case "minItems":
    case "maxItems": {
      const count = Array.isArray(e.data) ? e.data.length : 0;
      if (loc === LAYER_LIST) {
        sink.error("config/empty-layers", `${path} is empty; list at least one layer`, at);
        return;
      }
      sink.error("config/invalid-length", `${path} must have ${lengthRule(parent)}, got ${count}${lengthHint(loc)}`, at);
      return;
    }
    case "additionalProperties": {
      reportUnknownKey(e, node, loc, parent, sink);
      return;
    }
    case "not": {
      if (loc === MODEL_NOT_BOTH && node.kind === "map") {
        const layered = ["input", "output", "layers", "weight_sharing"].filter((k) => entryOf(node, k)).map((k) => `'${k}'`);
        sink.error(
          "config/model-kind",
          `${path} has both 'network' and ${layered.join(", ")}; a model is either layered ('input' + 'layers') or an explicit tensor network ('network'), not both`,
          at
        );
        return;
      }
      break;
    }
    default:
      break;
  }
  sink.error("config/schema", `${path} ${e.message ?? "is not valid"}`, at);
}
function reportUnknownKey(e, node, loc, parent, sink) {
  const key = String(e.params["additionalProperty"]);
  const entry = node.kind === "map" ? entryOf(node, key) : void 0;
  const at = entry?.keySpan ?? node.span;
  const path = displayPath(node);
  if (key === "<<") {
    sink.error("config/unknown-field", `${path} uses a YAML merge key ('<<'), which is not supported; write the fields out, or alias the whole mapping`, at);
    return;
  }
  const allowed = Object.keys(parent["properties"] ?? {});
  const guess = closest(key, [...allowed, ...aliasesAt(loc)]);
  sink.error(
    "config/unknown-field",
    `unknown field '${key}' in ${path}${guess ? ` (did you mean '${guess}'?)` : ""}; allowed: ${allowed.join(", ")}`,
    at
  );
}
function aliasesAt(loc) {
  return loc === INPUT2 ? [...INPUT_ALIASES.keys()] : [];
}
function suggestionFor(e, locations) {
  const key = String(e.params["additionalProperty"]);
  const loc = where(e, locations);
  const allowed = Object.keys(e.parentSchema?.["properties"] ?? {});
  const guess = closest(key, [...allowed, ...aliasesAt(loc)]);
  if (!guess) return void 0;
  return (loc === INPUT2 ? INPUT_ALIASES.get(guess) : void 0) ?? guess;
}
function reportRequired(group, root, locations, sink) {
  const first = group[0];
  if (!first) return;
  const node = locate(root, segmentsOf(first.instancePath)) ?? root;
  const path = displayPath(node);
  const loc = where(first, locations);
  const missing = group.map((e) => String(e.params["missingProperty"]));
  const quoted = missing.map((m) => `'${m}'`).join(" and ");
  if (loc === MODEL_EITHER_OR) {
    sink.error(
      "config/model-kind",
      `${path} needs either 'input' and 'layers' (a layered model) or 'network' (an explicit tensor network); missing ${quoted}`,
      node.span
    );
    return;
  }
  const properties = first.parentSchema?.["properties"] ?? {};
  const explained = missing.map((m) => {
    const d = Object.hasOwn(properties, m) ? properties[m]?.description : void 0;
    return typeof d === "string" ? `'${m}' (${d.replace(/\.$/, "").replace(/^[A-Z](?=[a-z])/, (c) => c.toLowerCase())})` : `'${m}'`;
  });
  sink.error("config/missing-field", `${path} is missing ${explained.join(" and ")}`, node.span);
}
function typeIncludes(schema, type) {
  const t = schema["type"];
  return t === type || Array.isArray(t) && t.includes(type);
}
function expected(schema, loc) {
  if (loc === LAYER_LIST) return "a list of layers";
  if (loc === "") return "a mapping (with 'input' and 'layers', or 'network')";
  const t = schema["type"];
  const types = Array.isArray(t) ? t.map(String) : [String(t)];
  const words = types.map((type) => {
    switch (type) {
      case "integer":
        return schema["minimum"] === 0 ? "a non-negative integer" : "a positive integer";
      case "array": {
        const items = schema["items"];
        if (types.length > 1 && items?.["type"] === "integer") return `a list of ${lengthRule(schema).replace(/ entries$/, "")} positive integers`;
        return "a list";
      }
      case "object":
        return "a mapping";
      case "string":
        return Array.isArray(schema["enum"]) ? `one of ${schema["enum"].map((v) => `'${String(v)}'`).join(", ")}` : "a string";
      case "boolean":
        return "true or false";
      default:
        return type;
    }
  });
  return words.join(" or ");
}
function lengthRule(schema) {
  const min = typeof schema["minItems"] === "number" ? schema["minItems"] : void 0;
  const max = typeof schema["maxItems"] === "number" ? schema["maxItems"] : void 0;
  if (min !== void 0 && max !== void 0) {
    if (min === max) return `${min} entries`;
    return max === min + 1 ? `${min} or ${max} entries` : `${min} to ${max} entries`;
  }
  if (min !== void 0) return `at least ${min} entries`;
  if (max !== void 0) return `at most ${max} entries`;
  return "a valid number of entries";
}
function lengthHint(loc) {
  if (loc?.endsWith("/properties/shape")) return " ([length] or [height, width])";
  if (loc === "/definitions/bond/properties/between") return " (a bond joins at least 2 tensors)";
  return "";
}

// src/config/yaml-errors.ts
var import_yaml3 = __toESM(require_dist(), 1);
function reportYamlErrors(doc, lines, sink) {
  const duplicates = doc.errors.some((e) => e.code === "DUPLICATE_KEY") ? duplicateKeys(doc, lines) : /* @__PURE__ */ new Map();
  for (const e of doc.errors) {
    const span = spanFromOffsets(lines, e.pos[0], e.pos[1]);
    if (e.code === "DUPLICATE_KEY") {
      const detail = duplicates.get(e.pos[0]);
      sink.error("config/duplicate-key", detail ?? "this key appears twice in one mapping; keep one", span);
    } else {
      sink.error("config/yaml", `invalid YAML: ${e.message}`, span);
    }
  }
}
function duplicateKeys(doc, lines) {
  const out = /* @__PURE__ */ new Map();
  (0, import_yaml3.visit)(doc, {
    Map(_, map) {
      const first = /* @__PURE__ */ new Map();
      for (const pair of map.items) {
        if (!(0, import_yaml3.isScalar)(pair.key) || !pair.key.range) continue;
        const name = String(pair.key.value);
        const at = pair.key.range[0];
        const earlier = first.get(name);
        if (earlier === void 0) first.set(name, at);
        else out.set(at, `the key '${name}' appears twice in one mapping (first on line ${lines.linePos(earlier).line}); keep one`);
      }
    }
  });
  return out;
}

// src/config/definition-document.ts
var DEFINITION_SCHEMA = "definition.schema.json";
var TYPES = /* @__PURE__ */ new Map([
  ["int", "int"],
  ["integer", "int"],
  ["number", "number"],
  ["float", "number"],
  ["decimal", "number"],
  ["list", "list"]
]);
var RESERVED_NAMES = /* @__PURE__ */ new Set(["ceil", "floor", "min", "max", "architecture"]);
var DEFAULT_STEP = { int: { n: 1n, d: 1n }, list: { n: 1n, d: 1n }, number: { n: 1n, d: 100n } };
var DefinitionSink = class extends DiagnosticSink {
  notes = /* @__PURE__ */ new Map();
  error(code, message, span) {
    const renamed = code.startsWith("config/") ? `definition/${code.slice("config/".length)}` : code;
    const note = span ? this.notes.get(span.offset) : void 0;
    super.error(renamed, note ? `${message} (${note})` : message, span);
  }
};
function readDefinition(text, file, path, sink) {
  const bytes = Buffer.byteLength(text, "utf8");
  if (bytes > MAX_DOCUMENT_BYTES) {
    sink.error("definition/too-large", `the definition file is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
    return void 0;
  }
  const lines = new import_yaml4.LineCounter();
  const doc = (0, import_yaml4.parseDocument)(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  reportYamlErrors(doc, lines, sink);
  if (sink.count > 0) return void 0;
  const root = convertNode(doc, lines, sink, doc.contents, [], spanFromOffsets(lines, 0, 0), { rootName: "the definition", subject: "architecture definition" });
  if (!root) return void 0;
  if (root.kind !== "map") {
    sink.error("definition/type", `the definition file holds ${describeValue(root)}; a definition is a mapping with 'name', 'description', 'parameters' and 'model'`, root.span);
    return void 0;
  }
  const { validate, locations } = compiledSchemaFile(DEFINITION_SCHEMA);
  if (!validate(toPlain(root))) reportSchemaErrors(validate.errors ?? [], root, locations, sink);
  if (sink.count > 0) return void 0;
  const parameters = /* @__PURE__ */ new Map();
  const params = fieldOf(root, "parameters");
  if (params?.kind === "map") {
    for (const entry of params.entries) {
      const decl = readParameter(entry.key, entry.keySpan, entry.value, sink);
      if (decl) parameters.set(entry.key, decl);
    }
  }
  const model = fieldOf(root, "model");
  const expressions = /* @__PURE__ */ new Map();
  collectExpressions(model, text, lines, expressions, sink);
  if (sink.count > 0) return void 0;
  return {
    file,
    path,
    name: stringOf(fieldOf(root, "name")),
    description: stringOf(fieldOf(root, "description")),
    lines,
    parameters,
    model,
    expressions
  };
}
function readParameter(name, keySpan, body, sink) {
  const where2 = `parameters.${name}`;
  if (RESERVED_NAMES.has(name)) {
    const why = name === "architecture" ? "a config names the definition with it" : "it is a function of the expressions";
    sink.error("definition/invalid-name", `${where2}: '${name}' cannot name a parameter: ${why}`, keySpan);
    return void 0;
  }
  const type = TYPES.get(stringOf(fieldOf(body, "type")));
  const bound = (key) => {
    const node = fieldOf(body, key);
    if (!node) return void 0;
    const v = exactNumber(node, sink, "definition");
    if (v === null) return void 0;
    if (!v || type !== "number" && !isInteger(v)) {
      sink.error("definition/invalid-number", `${displayPath(node)} must be ${type === "number" ? "a number" : "a whole number"} for a parameter of type ${type}, got ${describeValue(node)}`, node.span);
      return void 0;
    }
    return v;
  };
  const min = bound("min");
  const max = bound("max");
  const step = bound("step") ?? DEFAULT_STEP[type];
  if (!min || !max) return void 0;
  const maxNode = fieldOf(body, "max");
  if (compare(min, max) > 0) {
    sink.error("definition/invalid-range", `${displayPath(maxNode)} is ${formatExact(max)}, below min ${formatExact(min)}; the range is min to max, both included`, maxNode.span);
    return void 0;
  }
  const defaultNode = fieldOf(body, "default");
  const lengthNode = fieldOf(body, "length");
  if (lengthNode && type !== "list") {
    sink.error("definition/invalid-field", `${displayPath(lengthNode)}: only a list parameter has a length`, lengthNode.span);
    return void 0;
  }
  const declaredLength = lengthNode?.kind === "scalar" ? Number(lengthNode.value) : void 0;
  const decl = { name, type, min, max, step, description: stringOf(fieldOf(body, "description")), span: keySpan, ...declaredLength !== void 0 ? { length: declaredLength } : {} };
  const value = readParameterValue(defaultNode, decl, sink, "definition", displayPath(defaultNode));
  if (!value) return void 0;
  const length = Array.isArray(value) ? value.length : void 0;
  return { ...decl, default: value, ...length !== void 0 ? { length } : {} };
}
function readParameterValue(node, decl, sink, owner, what, declaredIn = "") {
  const range = `${formatExact(decl.min)} to ${formatExact(decl.max)}`;
  const one = (item, label) => {
    const v = exactNumber(item, sink, owner);
    if (v === null) return void 0;
    const whole = decl.type !== "number";
    if (!v || whole && !isInteger(v)) {
      sink.error(`${owner}/parameter-type`, `${label} must be ${whole ? "a whole number" : "a number"} (parameter ${decl.name} is of type ${decl.type}${declaredIn}), got ${describeValue(item)}`, item.span);
      return void 0;
    }
    if (compare(v, decl.min) < 0 || compare(v, decl.max) > 0) {
      const side = compare(v, decl.min) < 0 ? `below the minimum ${formatExact(decl.min)}` : `above the maximum ${formatExact(decl.max)}`;
      sink.error(`${owner}/parameter-range`, `${label} is ${formatExact(v)}, ${side}: parameter ${decl.name} allows ${range}${declaredIn}`, item.span);
      return void 0;
    }
    return v;
  };
  if (decl.type !== "list") {
    if (node.kind !== "scalar") {
      sink.error(`${owner}/parameter-type`, `${what} must be a number (parameter ${decl.name} is of type ${decl.type}${declaredIn}), got ${describeValue(node)}`, node.span);
      return void 0;
    }
    return one(node, what);
  }
  if (node.kind !== "seq") {
    sink.error(`${owner}/parameter-type`, `${what} must be a list of whole numbers (parameter ${decl.name} is a list${declaredIn}), got ${describeValue(node)}`, node.span);
    return void 0;
  }
  if (decl.length !== void 0 && node.items.length !== decl.length) {
    sink.error(`${owner}/parameter-length`, `${what} has ${node.items.length} entr${node.items.length === 1 ? "y" : "ies"}; parameter ${decl.name} takes ${decl.length}${declaredIn}`, node.span);
    return void 0;
  }
  if (node.items.length === 0) {
    sink.error(`${owner}/parameter-length`, `${what} is empty; parameter ${decl.name} takes at least one entry`, node.span);
    return void 0;
  }
  const out = [];
  let ok = true;
  node.items.forEach((item, i) => {
    const v = one(item, `${what}[${i}]`);
    if (v) out.push(v);
    else ok = false;
  });
  return ok ? out : void 0;
}
function exactNumber(node, sink, owner) {
  if (node.kind !== "scalar" || typeof node.value !== "number") return void 0;
  try {
    return fromNumber(node.value);
  } catch (e) {
    if (!(e instanceof OverflowError)) throw e;
    sink.error(`${owner}/number-too-large`, `${displayPath(node)} is ${String(node.value)}; parameter values stay below 2^63`, node.span);
    return null;
  }
}
function collectExpressions(node, text, lines, out, sink) {
  if (node.kind === "map") for (const e of node.entries) collectExpressions(e.value, text, lines, out, sink);
  else if (node.kind === "seq") for (const item of node.items) collectExpressions(item, text, lines, out, sink);
  else if (isExpressionText(node.value)) {
    const at = contentOffset(text, node);
    const parsed = parseExpression(node.value);
    if (parsed.ok) out.set(node, { text: node.value, expr: parsed.expr, ...at !== void 0 ? { at } : {} });
    else sink.error(parsed.error.code, `${displayPath(node)}: ${parsed.error.message}`, expressionSpan(lines, node, at, parsed.error.start, parsed.error.end));
  }
}
function contentOffset(text, node) {
  const raw = text.slice(node.span.offset, node.span.endOffset);
  const value = String(node.value);
  if (raw === value) return node.span.offset;
  const q = raw[0];
  if ((q === '"' || q === "'") && raw.length === value.length + 2 && raw.slice(1, -1) === value) return node.span.offset + 1;
  return void 0;
}
function expressionSpan(lines, node, at, start, end) {
  if (at === void 0) return node.span;
  return spanFromOffsets(lines, at + start, at + end);
}

// src/config/instantiate-definition.ts
function instantiate(def, bindings, sink) {
  const values = /* @__PURE__ */ new Map();
  for (const [name, b] of bindings) values.set(name, b.value);
  const used = /* @__PURE__ */ new WeakMap();
  let ok = true;
  const copy = (node, parent) => {
    if (node.kind === "map") {
      const map = { ...node, parent, entries: [] };
      for (const e of node.entries) map.entries.push({ ...e, value: copy(e.value, map) });
      return map;
    }
    if (node.kind === "seq") {
      const seq = { ...node, parent, items: [] };
      for (const item of node.items) seq.items.push(copy(item, seq));
      return seq;
    }
    const parsed = def.expressions.get(node);
    if (!parsed) return { ...node, parent };
    const result = evaluateExpression(parsed.expr, values);
    if (!result.ok) {
      ok = false;
      const read = describeBindings(bindings, namesOf(parsed.expr));
      sink.error(result.error.code, `${displayPath(node)}: ${result.error.message}${read ? ` (with ${read})` : ""}`, expressionSpan(def.lines, node, parsed.at, result.error.start, result.error.end));
      return { ...node, parent };
    }
    const out = { ...node, parent, value: toNumber(result.value) };
    used.set(out, result.used);
    sink.notes.set(node.span.offset, noteOf(parsed.text, result.value, result.used, bindings));
    return out;
  };
  const root = copy(def.model, def.model.parent);
  if (!ok) return void 0;
  const memo = /* @__PURE__ */ new WeakMap();
  const paramsOf = (node) => {
    const hit = memo.get(node);
    if (hit) return hit;
    const names = [];
    const visit3 = (n) => {
      for (const name of used.get(n) ?? []) if (!names.includes(name)) names.push(name);
      if (n.kind === "map") for (const e of n.entries) visit3(e.value);
      else if (n.kind === "seq") for (const item of n.items) visit3(item);
    };
    visit3(node);
    const uses = names.map((name) => {
      const span = bindings.get(name)?.span;
      return span ? { name, span } : { name };
    });
    memo.set(node, uses);
    return uses;
  };
  return { root, paramsOf };
}
function showValue(v) {
  return Array.isArray(v) ? `[${v.map(formatExact).join(", ")}]` : formatExact(v);
}
function describeBindings(bindings, names) {
  return names.filter((n) => bindings.has(n)).map((n) => {
    const b = bindings.get(n);
    return `${n} = ${showValue(b.value)} from ${b.where}`;
  }).join(", ");
}
function noteOf(text, value, names, bindings) {
  const read = describeBindings(bindings, names);
  return `computed as ${formatExact(value)} by '${text}'${read ? ` with ${read}` : ""}`;
}

// src/config/load-architecture.ts
function loadArchitecture(req, sink) {
  const fail2 = (more = []) => ({ ok: false, diagnostics: [...sink.sorted(), ...more] });
  const archEntry = entryOf(req.root, "architecture");
  const archNode = archEntry.value;
  const written = stringOf(archNode);
  if (written === void 0 || written.trim() === "") {
    sink.error("config/architecture", `${displayPath(archNode)} must be the path of an architecture definition, relative to this config (e.g. ../arch/residual.yaml), got ${describeValue(archNode)}`, archNode.span);
    return fail2();
  }
  if (req.configRel === void 0) {
    sink.error("config/architecture-outside-root", `${displayPath(archNode)}: this config lies outside the repository root, so its definition cannot be read; definitions are read only from inside the repository`, archNode.span);
    return fail2();
  }
  const where2 = resolveDefinitionPath(written, req.configRel);
  if (!where2.ok) {
    sink.error(where2.code, where2.message, archNode.span);
    return fail2();
  }
  const rel = where2.rel;
  const display = req.source.display(rel);
  const read = req.source.read(rel);
  if (read.kind !== "file") {
    const [code, message] = read.kind === "absent" ? ["config/architecture-missing", `architecture '${written}': there is no file ${rel} in the repository`] : [read.code === "symlink" ? "config/architecture-symlink" : read.code === "too-large" ? "config/architecture-too-large" : "config/architecture-unreadable", `architecture '${written}': ${read.message}`];
    sink.error(code, message, archNode.span);
    return fail2();
  }
  const defSink = new DefinitionSink(display);
  const definition = readDefinition(read.text, display, rel, defSink);
  if (!definition) {
    sink.error("config/architecture-failed", `architecture '${written}': ${display} did not load (its problems are listed with it)`, archNode.span);
    return fail2(defSink.sorted());
  }
  const judged = judgingDeclarations(definition, req.source, rel);
  const bindings = /* @__PURE__ */ new Map();
  const names = [...definition.parameters.keys()];
  for (const entry of req.root.entries) {
    if (entry === archEntry) continue;
    const decl = judged.get(entry.key) ?? definition.parameters.get(entry.key);
    if (!decl) {
      const guess = closest(entry.key, names);
      const list2 = names.length > 0 ? `its parameters are ${names.join(", ")}` : "it declares no parameters";
      sink.error(
        "config/unknown-parameter",
        `'${entry.writtenKey}' is not a parameter of ${display}${guess ? ` (did you mean '${guess}'?)` : ""}; ${list2} (a config that names an architecture sets only its parameters)`,
        entry.keySpan
      );
      continue;
    }
    const own = definition.parameters.get(entry.key);
    const judging = own && judged.get(entry.key) !== own ? ` (its range as the base revision declares it in ${display}: a change cannot widen a range for its own configs)` : ` (declared in ${display})`;
    const value = readParameterValue(entry.value, decl, sink, "config", displayPath(entry.value), judging);
    if (value === void 0) continue;
    const span = entry.value.span;
    const itemSpans = entry.value.kind === "seq" ? { itemSpans: entry.value.items.map((item) => item.span) } : {};
    bindings.set(entry.key, { value, span, ...itemSpans, where: `${sink.file}:${span.line}:${span.column}` });
  }
  if (sink.count > 0) return fail2();
  for (const [name, decl] of definition.parameters) if (!bindings.has(name)) bindings.set(name, { value: decl.default, where: `the default in ${display}` });
  const instance = { definition, configFile: req.file, span: archNode.span, bindings, judged };
  const model = makeModel(instance, req.read, defSink);
  if (!model) {
    sink.error("config/architecture-failed", `architecture '${written}': ${display} does not make a model with these parameters (its problems are listed with it)`, archNode.span);
    return fail2(defSink.sorted());
  }
  return { ok: true, model, instance };
}
function makeModel(instance, read, defSink) {
  const def = instance.definition;
  const made = instantiate(def, instance.bindings, defSink);
  if (!made) return void 0;
  if (entryOf(made.root, "network") !== void 0) {
    defSink.error("definition/network", `${displayPath(fieldOf(made.root, "network"))}: a definition describes a layered model (input and layers); write an explicit network in the config itself`, entryOf(made.root, "network").keySpan);
    return void 0;
  }
  const model = read(made.root, defSink, made.paramsOf);
  if (model === void 0 || model === "explicit" || defSink.count > 0) return void 0;
  const parameters = [...def.parameters.values()].map((decl) => {
    const b = instance.bindings.get(decl.name);
    return { name: decl.name, value: showValue(b.value), ...b.span ? { span: b.span } : {}, declared: decl.span };
  });
  return { ...model, architecture: { file: def.file, path: def.path, name: def.name, span: instance.span, parameters } };
}
function judgingDeclarations(def, source, rel) {
  const out = new Map(def.parameters);
  const judging = source.judging?.(rel);
  if (judging?.kind !== "file") return out;
  const other = readDefinition(judging.text, def.file, rel, new DefinitionSink(def.file));
  if (!other) return out;
  for (const [name, decl] of other.parameters) {
    const own = def.parameters.get(name);
    if (own && own.type === decl.type && (own.length === decl.length || own.type !== "list")) {
      if (sameRange(own, decl)) continue;
      out.set(name, { ...own, min: decl.min, max: decl.max });
    }
  }
  return out;
}
function sameRange(a, b) {
  return a.min.n === b.min.n && a.min.d === b.min.d && a.max.n === b.max.n && a.max.d === b.max.d;
}

// src/config/parameter-space.ts
function parameterSpace(instance, read) {
  const choices = [];
  for (const decl of instance.definition.parameters.values()) {
    const judged = instance.judged.get(decl.name) ?? decl;
    const b = instance.bindings.get(decl.name);
    const common = { name: decl.name, min: judged.min, max: judged.max, step: decl.step };
    if (Array.isArray(b.value)) {
      b.value.forEach((value, index) => {
        choices.push({ ...common, label: `${decl.name}[${index}]`, index, value, span: b.itemSpans?.[index] ?? b.span ?? instance.span, set: b.span !== void 0 });
      });
    } else choices.push({ ...common, label: decl.name, value: b.value, span: b.span ?? instance.span, set: b.span !== void 0 });
  }
  return {
    choices,
    withValue(choice, value) {
      const old = instance.bindings.get(choice.name);
      const next = choice.index === void 0 ? value : old.value.map((v, i) => i === choice.index ? value : v);
      const bindings = new Map(instance.bindings);
      bindings.set(choice.name, { ...old, value: next });
      return makeModel({ ...instance, bindings }, read, new DefinitionSink(instance.definition.file));
    }
  };
}

// src/config/model-pointer.ts
var import_yaml6 = __toESM(require_dist(), 1);

// src/config/model-candidates.ts
var import_yaml5 = __toESM(require_dist(), 1);
var MAX_VISITED = 5e3;
var MAX_CANDIDATES2 = 3;
function modelCandidates(doc) {
  const found = [];
  const queue = [{ node: doc.contents, path: [] }];
  for (let visited = 0; queue.length > 0 && visited < MAX_VISITED && found.length < MAX_CANDIDATES2; visited++) {
    const { node, path } = queue.shift();
    if ((0, import_yaml5.isMap)(node)) {
      const keys = node.items.map((p) => (0, import_yaml5.isScalar)(p.key) ? String(p.key.value) : void 0);
      const network = node.items[keys.indexOf("network")]?.value;
      const layered = keys.includes("input") && keys.includes("layers") || keys.includes("architecture");
      if (layered || (0, import_yaml5.isMap)(network) && network.items.some((p) => (0, import_yaml5.isScalar)(p.key) && p.key.value === "tensors")) {
        found.push(formatPointer(path));
        continue;
      }
      node.items.forEach((p, i) => {
        if (keys[i] !== void 0) queue.push({ node: p.value, path: [...path, keys[i]] });
      });
    } else if ((0, import_yaml5.isSeq)(node)) {
      node.items.forEach((item, i) => queue.push({ node: item, path: [...path, i] }));
    }
  }
  return found;
}

// src/config/model-pointer.ts
function resolveModelNode(doc, lines, sink, pointer, segments) {
  const anchors = new AnchorIndex(doc);
  const docSpan = spanFromOffsets(lines, 0, 0);
  let cur = doc.contents;
  let curSpan = spanOfRange(lines, rangeOf(cur)) ?? docSpan;
  const walked = [];
  const fail2 = (detail, hintKeys) => {
    const where2 = walked.length === 0 ? "the document" : formatFieldPath(walked);
    const keys = hintKeys.length > 0 ? ` (it has ${hintKeys.slice(0, 8).map((k) => `'${k}'`).join(", ")}${hintKeys.length > 8 ? ", …" : ""})` : "";
    sink.error("config/model-missing", `the model path '${pointer}' does not resolve: ${where2} ${detail}${keys}; ${pathHint(doc, walked, hintKeys)}`, curSpan);
    return void 0;
  };
  for (let i = 0; i < segments.length; i++) {
    const seg = segments[i];
    if ((0, import_yaml6.isAlias)(cur)) cur = anchors.resolve(cur);
    if ((0, import_yaml6.isMap)(cur)) {
      const keys = [];
      let found;
      for (const pair of cur.items) {
        const k = (0, import_yaml6.isScalar)(pair.key) ? pair.key.value : void 0;
        if (k === void 0 || k !== null && typeof k === "object") continue;
        keys.push(String(k));
        if (String(k) === seg) found = { value: pair.value, keyRange: rangeOf(pair.key) };
      }
      if (!found) {
        const guess = closest(seg, keys);
        return fail2(`has no key '${seg}'${guess ? ` (did you mean '${guess}'?)` : ""}`, guess ? [] : keys);
      }
      walked.push(seg);
      const keySpan = spanOfRange(lines, found.keyRange) ?? curSpan;
      cur = found.value;
      curSpan = spanOfRange(lines, rangeOf(cur)) ?? spanFromOffsets(lines, keySpan.endOffset, keySpan.endOffset);
    } else if ((0, import_yaml6.isSeq)(cur)) {
      if (!isArrayIndex(seg) || Number(seg) >= cur.items.length) {
        return fail2(`is a list of ${cur.items.length} entries, so '${seg}' is not one of its indices`, []);
      }
      walked.push(Number(seg));
      cur = cur.items[Number(seg)];
      curSpan = spanOfRange(lines, rangeOf(cur)) ?? curSpan;
    } else {
      return fail2(cur === null || cur === void 0 || (0, import_yaml6.isScalar)(cur) && cur.value === null ? `is empty, so it has no '${seg}'` : `is a single value, so it has no '${seg}'`, []);
    }
  }
  if (cur === null || cur === void 0) {
    if (segments.length === 0) {
      sink.error("config/model-missing", `the document is empty; expected the model architecture at '${pointer || "/"}' (see --model-path)`, docSpan);
      return void 0;
    }
  }
  return { node: cur, segments: walked, fallback: curSpan };
}
function rangeOf(node) {
  if (node && typeof node === "object" && "range" in node) {
    const r = node.range;
    if (Array.isArray(r) && r.length === 3) return r;
  }
  return void 0;
}
function pathHint(doc, walked, keys) {
  const candidates2 = modelCandidates(doc);
  if (candidates2.length > 0) {
    const list2 = candidates2.map((c) => `--model-path ${c === "" ? "''" : c}`).join(" or ");
    return `this file holds an architecture elsewhere: pass ${list2} (or set model_path in the policy)`;
  }
  if (keys.length > 0) {
    return `pass --model-path with the JSON pointer of the architecture, which starts with one of the keys listed, e.g. --model-path ${formatPointer([...walked, keys[0]])}`;
  }
  return "pass --model-path with the JSON pointer of the architecture (or set model_path in the policy)";
}

// src/config/layer-entry-count.ts
var LIST_KEYS = new Set(["layers", "body", "main", "path", "shortcut", "projection", "downsample", "skip"].map(normaliseWord));
var PATHS_KEYS = new Set(["paths", "branches"].map(normaliseWord));
function checkLayerEntryCount(root, sink) {
  if (root.kind !== "map") return true;
  const layers = fieldOf(root, "layers");
  if (layers?.kind !== "seq") return true;
  const count = countList(layers);
  if (count <= MAX_EXPANDED_LAYERS) return true;
  sink.error(
    "config/too-many-layers",
    `${displayPath(layers)} lists ${count} layers (counting those inside blocks); at most ${MAX_EXPANDED_LAYERS} layers are allowed`,
    layers.span
  );
  return false;
}
function countList(list2) {
  if (list2.kind !== "seq") return 0;
  let n = 0;
  for (const item of list2.items) n += countEntry(item);
  return n;
}
function countEntry(item) {
  if (item.kind !== "map") return 1;
  const maps = [item, ...item.entries.map((e) => e.value).filter((v) => v.kind === "map")];
  let nested = 0;
  let holds = false;
  for (const m of maps) {
    if (m.kind !== "map") continue;
    for (const e of m.entries) {
      const key = normaliseWord(e.key);
      if (LIST_KEYS.has(key) && e.value.kind === "seq") {
        holds = true;
        nested += countList(e.value);
      } else if (PATHS_KEYS.has(key) && e.value.kind === "seq") {
        holds = true;
        for (const p of e.value.items) nested += p.kind === "seq" ? countList(p) : countEntry(p);
      }
    }
  }
  return holds ? nested : 1;
}

// src/config/size-limits.ts
function checkModelSizes(root, sink) {
  walk(root, sink);
  if (root.kind !== "map") return;
  for (const holder of ["input", "network"]) {
    const node = fieldOf(root, holder);
    const shape = node?.kind === "map" ? fieldOf(node, "shape") : void 0;
    if (shape?.kind !== "seq") continue;
    let positions = 1;
    for (const item of shape.items) {
      if (item.kind !== "scalar" || typeof item.value !== "number" || !(item.value >= 1)) return;
      positions *= item.value;
    }
    if (positions > MAX_INPUT_POSITIONS) {
      const count = Number.isSafeInteger(positions) ? positions.toLocaleString("en-US") : `more than ${Number.MAX_SAFE_INTEGER.toLocaleString("en-US")}`;
      sink.error(
        "network/too-large",
        `${displayPath(shape)} has ${count} positions; rankfloor analyses inputs of at most ${MAX_INPUT_POSITIONS.toLocaleString("en-US")} positions (every position is a node of the tensor network)`,
        shape.span
      );
    }
  }
}
function walk(node, sink) {
  if (node.kind === "scalar") {
    const v = node.value;
    if (typeof v === "number" && v > MAX_MODEL_INTEGER) {
      sink.error(
        "config/number-too-large",
        `${displayPath(node)} is ${Number.isSafeInteger(v) ? v : String(v)}; rankfloor accepts sizes and counts up to ${MAX_MODEL_INTEGER} (2^31 − 1), far beyond any real architecture`,
        node.span
      );
    }
    return;
  }
  if (node.kind === "seq") for (const item of node.items) walk(item, sink);
  else for (const e of node.entries) walk(e.value, sink);
}

// src/config/load-config.ts
var DEFAULT_MODEL_PATH = "/model";
function loadConfigText(text, file, options = {}) {
  const sink = new DiagnosticSink(file);
  const fail2 = () => ({ ok: false, diagnostics: sink.sorted() });
  const bytes = Buffer.byteLength(text, "utf8");
  if (bytes > MAX_DOCUMENT_BYTES) return tooLarge(sink, bytes);
  const modelPath = options.modelPath ?? DEFAULT_MODEL_PATH;
  const pointer = parsePointer(modelPath);
  if (!pointer.ok) {
    sink.error("config/model-path", pointer.message);
    return fail2();
  }
  const lines = new import_yaml7.LineCounter();
  const doc = (0, import_yaml7.parseDocument)(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  reportYamlErrors(doc, lines, sink);
  if (sink.count > 0) return fail2();
  const found = resolveModelNode(doc, lines, sink, modelPath, pointer.segments);
  if (!found) return fail2();
  const root = convertNode(doc, lines, sink, found.node, found.segments, found.fallback);
  if (!root) return fail2();
  if (root.kind === "map" && entryOf(root, "architecture") !== void 0) {
    const around = options.definitions && options.configPath !== void 0 ? void 0 : repositoryOf(file);
    const source = options.definitions ?? workTreeDefinitions(around.root);
    const configRel = insideRoot(options.configPath ?? around.configRel);
    const read = (tree, into, paramsOf) => {
      const m = modelFromTree(tree, file, into, paramsOf);
      return m?.kind === "explicit" ? "explicit" : m;
    };
    const loaded = loadArchitecture({ root, file, configRel, source, read }, sink);
    if (!loaded.ok) return { ok: false, diagnostics: loaded.diagnostics };
    return { ok: true, model: loaded.model, parameters: parameterSpace(loaded.instance, read) };
  }
  const model = modelFromTree(root, file, sink);
  if (sink.count > 0 || !model) {
    if (sink.count === 0) throw new Error(`config loader: no model and no diagnostic for ${file} (a loader bug)`);
    return fail2();
  }
  return { ok: true, model };
}
function modelFromTree(root, file, sink, paramsOf) {
  normaliseFieldAliases(root, sink);
  if (!checkLayerEntryCount(root, sink)) return void 0;
  checkModelSizes(root, sink);
  const schema = compiledModelSchema();
  reportSchemaErrors(validateAgainstSchema(toPlain(root)), root, schema.locations, sink);
  let model;
  if (root.kind === "map") {
    const explicit = entryOf(root, "network") !== void 0;
    const layered = ["input", "output", "layers", "weight_sharing"].some((k) => entryOf(root, k) !== void 0);
    if (explicit && !layered) model = buildExplicitModel(root, file, sink);
    else if (layered && !explicit) model = buildLayeredModel(root, file, sink, paramsOf);
  }
  if (model?.kind === "layered" && sink.count === 0) {
    const shapes = inferShapes(model);
    if (!shapes.ok) for (const d of shapes.diagnostics) sink.error(d.code, d.message, d.span);
  }
  return sink.count > 0 ? void 0 : model;
}
function insideRoot(rel) {
  return rel === "" || rel === ".." || rel.startsWith("../") || /^[A-Za-z]:/.test(rel) || rel.startsWith("/") ? void 0 : rel;
}
function tooLarge(sink, bytes) {
  sink.error(
    "config/too-large",
    `the config is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`
  );
  return { ok: false, diagnostics: sink.sorted() };
}

// src/config/model-diff.ts
var same2 = (...names) => names.map((n) => [n, n]);
var FIELDS = {
  conv: [...same2("channels", "kernel", "stride", "dilation", "padding", "groups"), ["depthMultiplier", "depth_multiplier"]],
  "conv-transpose": [...same2("channels", "kernel", "stride", "dilation", "padding"), ["outputPadding", "output_padding"], ["groups", "groups"]],
  pool: same2("mode", "window", "stride", "padding", "global"),
  dense: same2("units"),
  flatten: [],
  upsample: same2("factor", "mode"),
  recurrent: same2("hidden", "depth", "cell", "bidirectional", "merge", "sequence"),
  embedding: same2("dim"),
  position: same2("mode"),
  "class-token": [],
  attention: [...same2("heads"), ["headDim", "head_dim"], ...same2("causal", "window")],
  pointwise: same2("op"),
  merge: same2("mode")
};

// src/check/compare-config.ts
function loadConfig(text, file, policy, errors, where2) {
  const loaded = loadConfigText(text, file, { ...policy.modelPath === void 0 ? {} : { modelPath: policy.modelPath }, ...where2 });
  if (!loaded.ok) {
    errors.push(...loaded.diagnostics);
    return void 0;
  }
  return loaded.parameters ? { model: loaded.model, parameters: loaded.parameters } : { model: loaded.model };
}

// src/check/base-evaluation.ts
var WORKER_FILE = new URL("./base-worker.js", import.meta.url);
function evaluateBaseTexts(tasks2, progress) {
  const memo = /* @__PURE__ */ new Map();
  const policyIds = /* @__PURE__ */ new Map();
  return tasks2.map((t) => {
    progress?.();
    const loaded = loadConfig(t.text, t.file, t.policy, [], t.path === void 0 ? void 0 : { definitions: recordedDefinitions(t.definitions ?? {}), configPath: t.path });
    if (!loaded) return void 0;
    const model = loaded.model;
    let id = policyIds.get(t.policy);
    if (id === void 0) policyIds.set(t.policy, id = policyIds.size);
    const key = `${id}\0${modelKey(model)}`;
    const known = memo.get(key);
    if (known) return { model, result: known.result };
    const evaluated = evaluatePolicy(model, t.policy, { fixes: false });
    const answer = evaluated.ok ? { model, result: evaluated.result } : void 0;
    memo.set(key, answer);
    return answer;
  });
}
function recordedDefinitions(texts) {
  return {
    read: (rel) => Object.hasOwn(texts, rel) ? { kind: "file", text: texts[rel] } : { kind: "absent" },
    display: (rel) => rel
  };
}
var PLACE = /* @__PURE__ */ new Set(["file", "span", "fieldSpans"]);
function modelKey(model) {
  return JSON.stringify(model, (k, v) => PLACE.has(k) ? void 0 : typeof v === "bigint" ? `${v}n` : v);
}

// src/check/base-worker.ts
var { tasks, port, flag } = workerData;
try {
  port.postMessage({ answers: evaluateBaseTexts(tasks, () => Atomics.add(flag, 1, 1)) });
} catch (e) {
  port.postMessage({ error: e instanceof Error ? e.message : String(e) });
} finally {
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
  port.close();
}
